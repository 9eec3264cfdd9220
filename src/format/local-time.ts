// Times on screen read like the briefing's ("5 December 2026, 13:47 CST"), in the organisation's
// time zone (its setting, else the deployment's) and naming it; the viewer's own zone only until
// the organisation's settings are read.
import { formatCompactDateTime, formatDateTime } from '@shared/format/numbers';
import { preferences } from './preferences';

export function localTimeZone(): string {
  return Intl.DateTimeFormat().resolvedOptions().timeZone || 'UTC';
}

/** The zone screen times are given in. */
export function screenTimeZone(): string {
  return preferences.timeZone ?? localTimeZone();
}

export function formatLocalDateTime(at: string | Date): string {
  return formatDateTime(new Date(at), screenTimeZone());
}

/** The short form for lists and run labels: "5 Dec 2026, 13:47 CST" (never "12/5"). */
export function formatCompactLocalDateTime(at: string | Date): string {
  return formatCompactDateTime(new Date(at), screenTimeZone());
}
