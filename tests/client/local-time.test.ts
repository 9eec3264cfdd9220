// Screen times use the briefing's one date formatter, in the organisation's zone (the viewer's
// until the organisation's settings are read), with the zone named; lists use a short form that
// is never a numeric US-style date.
import { afterEach, describe, expect, it } from 'vitest';
import { formatDateTime } from '../../shared/format/numbers';
import { formatCompactLocalDateTime, formatLocalDateTime, localTimeZone, screenTimeZone } from '../../src/format/local-time';
import { setPreferences } from '../../src/format/preferences';

afterEach(() => setPreferences({ unitSystem: 'metric', timeZone: null }));

describe('formatLocalDateTime', () => {
  it('prints what the briefing prints for the same instant in the viewer zone before the settings are read', () => {
    const at = '2026-12-05T13:47:00Z';
    expect(screenTimeZone()).toBe(localTimeZone());
    expect(formatLocalDateTime(at)).toBe(formatDateTime(new Date(at), localTimeZone()));
  });

  it('follows the organisation zone once set', () => {
    setPreferences({ unitSystem: 'metric', timeZone: 'Europe/Berlin' });
    // 13:47 UTC is 14:47 in Berlin in December (CET = UTC+1; IANA tz database).
    expect(formatLocalDateTime('2026-12-05T13:47:00Z')).toBe('5 December 2026, 14:47 CET');
    setPreferences({ unitSystem: 'metric', timeZone: 'UTC' });
    expect(formatLocalDateTime('2026-12-05T13:47:00Z')).toBe('5 December 2026, 13:47 UTC');
  });

  it('spells the month out and names the zone, never a numeric US-style date', () => {
    const text = formatLocalDateTime(new Date('2026-12-05T13:47:00Z'));
    expect(text).toMatch(/^\d{1,2} December 2026, \d{2}:\d{2} \S+/);
    expect(text).not.toMatch(/\d+\/\d+\/\d+/);
  });
});

describe('formatCompactLocalDateTime', () => {
  it('gives day, short month, year, a 24-hour time and the zone', () => {
    setPreferences({ unitSystem: 'metric', timeZone: 'America/Chicago' });
    // 13:47 UTC is 07:47 in Chicago in December (CST = UTC−6; IANA tz database).
    expect(formatCompactLocalDateTime('2026-12-05T13:47:00Z')).toBe('5 Dec 2026, 07:47 GMT-6');
    setPreferences({ unitSystem: 'metric', timeZone: 'UTC' });
    expect(formatCompactLocalDateTime('2026-12-05T21:05:00Z')).toBe('5 Dec 2026, 21:05 UTC');
  });
});
