// Times on screen read like the briefing's ("5 December 2026, 13:47 UTC"), in the viewer's own
// time zone and naming it, until an organisation chooses its own.
import { formatDateTime } from '@shared/format/numbers';

export function localTimeZone(): string {
  return Intl.DateTimeFormat().resolvedOptions().timeZone || 'UTC';
}

export function formatLocalDateTime(at: string | Date): string {
  return formatDateTime(new Date(at), localTimeZone());
}
