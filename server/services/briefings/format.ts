// How a briefing writes numbers, durations and dates. One place, so the summary, the tables,
// the charts and the tests agree on "4,320" and "2 h 10 min".

const integer = new Intl.NumberFormat('en-US', { maximumFractionDigits: 0 });
const oneDecimal = new Intl.NumberFormat('en-US', { minimumFractionDigits: 1, maximumFractionDigits: 1 });
const twoDecimals = new Intl.NumberFormat('en-US', { maximumFractionDigits: 2 });

/** Rounded to a whole number with thousands separators: 4319.6 → "4,320". */
export function formatCount(value: number): string {
  // Intl keeps "-0" for values that round to zero from below; nobody wants that on paper.
  const rounded = Math.round(value);
  return integer.format(rounded === 0 ? 0 : rounded);
}

/** Up to two decimals, trailing zeros dropped: 2.4 → "2.4", 0.86 → "0.86". */
export function formatDecimal(value: number): string {
  return twoDecimals.format(value);
}

/** A share 0..1 as a percentage with one decimal below 10 % and none above: "100 %", "4.8 %". */
export function formatPercent(share: number): string {
  const pct = share * 100;
  if (pct !== 0 && Math.abs(pct) < 10) return `${oneDecimal.format(pct)} %`;
  return `${integer.format(Math.round(pct))} %`;
}

/** Minutes as hours and minutes: 130 → "2 h 10 min", 45 → "45 min", 120 → "2 h". */
export function formatDuration(minutes: number): string {
  const total = Math.round(minutes);
  const h = Math.floor(total / 60);
  const m = total % 60;
  if (h === 0) return `${m} min`;
  return m === 0 ? `${h} h` : `${h} h ${m} min`;
}

/** A horizon or step in the largest whole unit: 180 → "3 hours", 90 → "90 minutes". */
export function formatSpan(minutes: number): string {
  if (minutes % 60 === 0) return minutes === 60 ? '1 hour' : `${minutes / 60} hours`;
  return `${integer.format(minutes)} minutes`;
}

/** Seconds as the step a planner chose: 60 → "1 minute", 300 → "5 minutes", 30 → "30 seconds". */
export function formatStep(seconds: number): string {
  if (seconds % 60 === 0) return seconds === 60 ? '1 minute' : `${seconds / 60} minutes`;
  return `${seconds} seconds`;
}

/** "2 December 2026, 14:05 UTC" in the organisation's time zone (IANA name). */
export function formatDateTime(at: Date, timeZone: string): string {
  const date = new Intl.DateTimeFormat('en-GB', { timeZone, day: 'numeric', month: 'long', year: 'numeric' }).format(at);
  const time = new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit', hourCycle: 'h23', timeZoneName: 'short' }).format(at);
  return `${date}, ${time}`;
}

/** "2 December 2026" in the organisation's time zone. */
export function formatDate(at: Date, timeZone: string): string {
  return new Intl.DateTimeFormat('en-GB', { timeZone, day: 'numeric', month: 'long', year: 'numeric' }).format(at);
}
