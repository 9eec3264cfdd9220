// Figures as planners read them: whole vehicles and persons with thousands separators, hours
// and minutes instead of raw minutes, shares as percentages. One fixed locale so that a
// briefing and the screen say the same thing.
const locale = 'en-US';
const whole = new Intl.NumberFormat(locale, { maximumFractionDigits: 0 });
const oneDecimal = new Intl.NumberFormat(locale, { maximumFractionDigits: 1 });

export const formatCount = (n: number) => whole.format(Math.round(n));

export function formatPerHour(n: number, unit: 'veh' | 'persons' = 'veh'): string {
  return `${formatCount(n)} ${unit === 'veh' ? 'veh/h' : 'persons/h'}`;
}

/** 0.357 → "36 %"; small shares keep a decimal so that they do not read as zero, and shares
 *  just short of all are cut (not rounded) to a decimal, so that 99.7 % never reads as 100 %. */
export function formatShare(share: number): string {
  if (!Number.isFinite(share)) return '–';
  const pct = share * 100;
  if (pct > 0 && pct < 10) return `${oneDecimal.format(pct)} %`;
  if (pct > 99 && pct < 100) return `${oneDecimal.format(Math.floor(pct * 10) / 10)} %`;
  return `${whole.format(pct)} %`;
}

/** 45 → "45 min", 185 → "3 h 05 min", 360 → "6 h". */
export function formatDuration(minutes: number): string {
  if (!Number.isFinite(minutes)) return '–';
  const total = Math.round(minutes);
  if (total < 60) return `${total} min`;
  const h = Math.floor(total / 60);
  const m = total % 60;
  return m === 0 ? `${h} h` : `${h} h ${String(m).padStart(2, '0')} min`;
}

/** A time after the order, or the words a planner needs when it never came within the horizon. */
export function formatTimeWithin(minutes: number | null, horizonMinutes: number): string {
  return minutes === null ? `Not within the ${formatDuration(horizonMinutes)} horizon` : formatDuration(minutes);
}

/** Minutes after the order as a clock offset: 95 → "1:35". */
export function formatClockOffset(minutes: number): string {
  const total = Math.round(minutes);
  return `${Math.floor(total / 60)}:${String(total % 60).padStart(2, '0')}`;
}

/** Cut windows [[0, 90], [120, 360]] → "0:00–1:30, 2:00–6:00" (after the order). */
export function formatWindows(windows: readonly (readonly [number, number])[]): string {
  if (windows.length === 0) return 'none';
  return windows.map(([a, b]) => `${formatClockOffset(a)}–${formatClockOffset(b)}`).join(', ');
}

export function formatMeters(m: number): string {
  return m >= 1000 ? `${oneDecimal.format(m / 1000)} km` : `${whole.format(m)} m`;
}
