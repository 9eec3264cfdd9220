// Figures as the findings print them.
import { describe, expect, it } from 'vitest';
import { formatClockOffset, formatCount, formatDuration, formatMeters, formatPerHour, formatShare, formatTimeWithin, formatWindows } from '../../../shared/format/numbers';

describe('number formats', () => {
  it('rounds counts and separates thousands', () => {
    expect(formatCount(5600.4)).toBe('5,600');
    expect(formatPerHour(11200, 'persons')).toBe('11,200 persons/h');
    expect(formatPerHour(850)).toBe('850 veh/h');
  });

  it('shows shares as percentages, small ones with a decimal', () => {
    expect(formatShare(0.357)).toBe('36 %');
    expect(formatShare(0.042)).toBe('4.2 %');
    expect(formatShare(0)).toBe('0 %');
    expect(formatShare(Number.NaN)).toBe('–');
    expect(formatShare(23135 / 23205)).toBe('99.6 %');
    expect(formatShare(0.9999)).toBe('99.9 %');
    expect(formatShare(1)).toBe('100 %');
  });

  it('writes durations in hours and minutes', () => {
    expect(formatDuration(45)).toBe('45 min');
    expect(formatDuration(185)).toBe('3 h 05 min');
    expect(formatDuration(360)).toBe('6 h');
    expect(formatDuration(59.6)).toBe('1 h');
  });

  it('says "not within the horizon" instead of a missing time', () => {
    expect(formatTimeWithin(null, 360)).toBe('Not within the 6 h horizon');
    expect(formatTimeWithin(250, 360)).toBe('4 h 10 min');
  });

  it('writes cut windows as clock offsets after the order', () => {
    expect(formatClockOffset(95)).toBe('1:35');
    expect(formatWindows([[0, 90], [120, 360]])).toBe('0:00–1:30, 2:00–6:00');
    expect(formatWindows([])).toBe('none');
  });

  it('writes lengths in m or km', () => {
    expect(formatMeters(850)).toBe('850 m');
    expect(formatMeters(253_400)).toBe('253.4 km');
  });
});
