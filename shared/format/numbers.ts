// Figures as planners read them, one module for the workspace and the briefing so that both
// print the same string for the same value: whole vehicles and persons with thousands
// separators, hours and minutes instead of raw minutes, shares as percentages, dates in the
// organisation's time zone with the zone named. One fixed locale on purpose.
const locale = 'en-US';
const whole = new Intl.NumberFormat(locale, { maximumFractionDigits: 0 });
const oneDecimal = new Intl.NumberFormat(locale, { maximumFractionDigits: 1 });
const twoDecimals = new Intl.NumberFormat(locale, { maximumFractionDigits: 2 });

/** Rounded to a whole number with thousands separators: 4319.6 → "4,320" (never "-0"). */
export function formatCount(n: number): string {
  const rounded = Math.round(n);
  return whole.format(rounded === 0 ? 0 : rounded);
}

/** Up to two decimals, trailing zeros dropped: 2.4 → "2.4", 0.86 → "0.86". */
export function formatDecimal(n: number): string {
  return twoDecimals.format(n);
}

export function formatPerHour(n: number, unit: 'veh' | 'persons' = 'veh'): string {
  return `${formatCount(n)} ${unit === 'veh' ? 'veh/h' : 'persons/h'}`;
}

/** 0.357 → "36 %"; small shares keep a decimal so that they do not read as zero, and shares
 *  just short of all are cut (not rounded) to a decimal, so that 99.7 % never reads as 100 %. */
export function formatShare(share: number): string {
  if (!Number.isFinite(share)) return '–';
  const pct = share * 100;
  if (pct !== 0 && Math.abs(pct) < 10) return `${oneDecimal.format(pct)} %`;
  if (pct > 99 && pct < 100) return `${oneDecimal.format(Math.floor(pct * 10) / 10)} %`;
  const rounded = Math.round(pct);
  return `${whole.format(rounded === 0 ? 0 : rounded)} %`;
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

/** Decimal hours after the order (a chart's x value) as a duration: 1.5 → "1 h 30 min". */
export function formatHours(hours: number): string {
  return formatDuration(hours * 60);
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

/** A horizon or step in the largest whole unit: 180 → "3 hours", 90 → "90 minutes". */
export function formatSpan(minutes: number): string {
  if (minutes % 60 === 0) return minutes === 60 ? '1 hour' : `${minutes / 60} hours`;
  return `${whole.format(minutes)} minutes`;
}

/** Seconds as the step a planner chose: 60 → "1 minute", 300 → "5 minutes", 30 → "30 seconds". */
export function formatStep(seconds: number): string {
  if (seconds % 60 === 0) return seconds === 60 ? '1 minute' : `${seconds / 60} minutes`;
  return `${seconds} seconds`;
}

/** "2 December 2026, 14:05 UTC" in a time zone (IANA name), the zone named. */
export function formatDateTime(at: Date, timeZone: string): string {
  const date = new Intl.DateTimeFormat('en-GB', { timeZone, day: 'numeric', month: 'long', year: 'numeric' }).format(at);
  const time = new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23', timeZoneName: 'short' }).format(at);
  return `${date}, ${time}`;
}

/** "2 December 2026" in a time zone. */
export function formatDate(at: Date, timeZone: string): string {
  return new Intl.DateTimeFormat('en-GB', { timeZone, day: 'numeric', month: 'long', year: 'numeric' }).format(at);
}

/** Metres as m below 1 km, else km with a decimal: 850 → "850 m", 253,400 → "253.4 km". */
export function formatMeters(m: number): string {
  return m >= 1000 ? `${oneDecimal.format(m / 1000)} km` : `${whole.format(m)} m`;
}

/** The short, non-ambiguous form for lists and run labels: "5 Dec 2026, 14:05 UTC" (day, month
 *  name, year, 24-hour clock, zone named; never a numeric date that reads differently abroad). */
export function formatCompactDateTime(at: Date, timeZone: string): string {
  const date = new Intl.DateTimeFormat('en-GB', { timeZone, day: 'numeric', month: 'short', year: 'numeric' }).format(at);
  const time = new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23', timeZoneName: 'short' }).format(at);
  return `${date}, ${time}`;
}
