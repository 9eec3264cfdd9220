// Screen times use the briefing's one date formatter, in the viewer's zone, with the zone named.
import { describe, expect, it } from 'vitest';
import { formatDateTime } from '../../shared/format/numbers';
import { formatLocalDateTime, localTimeZone } from '../../src/format/local-time';

describe('formatLocalDateTime', () => {
  it('prints what the briefing prints for the same instant in the viewer zone', () => {
    const at = '2026-12-05T13:47:00Z';
    expect(formatLocalDateTime(at)).toBe(formatDateTime(new Date(at), localTimeZone()));
  });

  it('spells the month out and names the zone, never a numeric US-style date', () => {
    const text = formatLocalDateTime(new Date('2026-12-05T13:47:00Z'));
    expect(text).toMatch(/^\d{1,2} December 2026, \d{2}:\d{2} \S+/);
    expect(text).not.toMatch(/\d+\/\d+\/\d+/);
  });
});
