// The shape of briefings.content as the column knows it. No drizzle here: the briefing PDF code
// (which may run in a worker thread) imports this without the database layer.
/** The format tag of the stored content; a new shape gets a new tag. */
export const BRIEFING_CONTENT_FORMAT = 'cutline-briefing-content/1';

/** The content as JSON (Dates as ISO strings): what the database keeps. Its full shape is the
 * briefing service's (server/services/briefings/content-fingerprint.ts); the column knows only
 * what identifies it, so the schema stays below the services. */
export type StoredBriefingContent = Record<string, unknown> & { format: typeof BRIEFING_CONTENT_FORMAT; briefingId: string };
