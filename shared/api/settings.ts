// Map settings: the basemap is optional — with no tile URL the map shows the vector layers on a
// neutral background, so Cutline works offline.
import { z } from 'zod';
import { unitSystemSchema } from './units';

const hostLabel = '[a-z0-9{}](?:[a-z0-9{}-]{0,61}[a-z0-9{}])?';
const hostShapedTileUrl = new RegExp(`^https?://(?:${hostLabel}(?:\\.${hostLabel})*|\\[[0-9a-f:.]+\\])(?::\\d{1,5})?/`, 'i');

export const mapSettingsSchema = z.object({
  tileUrl: z
    .string()
    .trim()
    .max(500)
    .refine((u) => u === '' || /^https?:\/\/[^\s]+$/.test(u), 'Give an http(s) URL with {z}, {x} and {y}, or leave it empty.')
    .refine((u) => u === '' || (u.includes('{z}') && u.includes('{x}') && u.includes('{y}')), 'The URL needs {z}, {x} and {y} placeholders.')
    // The server's host must be a plain host name or address (with a port, placeholders such as
    // {s} allowed): its origin goes into the Content-Security-Policy of every response.
    .refine((u) => u === '' || hostShapedTileUrl.test(u), 'Give the tile server as a plain host name or address, e.g. https://tiles.example.org/{z}/{x}/{y}.png.'),
  attribution: z.string().trim().max(300),
});
export type MapSettings = z.infer<typeof mapSettingsSchema>;

/** A time zone the runtime knows (IANA name such as "America/Chicago", or "UTC"). */
export function isKnownTimeZone(tz: string): boolean {
  try {
    new Intl.DateTimeFormat('en-US', { timeZone: tz });
    return true;
  } catch {
    return false;
  }
}

const timeZoneSchema = z
  .string()
  .trim()
  .min(1)
  .max(64)
  .refine((tz) => /^[A-Za-z0-9_+\-/]+$/.test(tz) && isKnownTimeZone(tz), 'Give a time zone by its IANA name, e.g. America/Chicago or Europe/Berlin.');

/** The organisation's units and time zone: what every screen, form, export and briefing of it
 *  uses. A null time zone follows the deployment's BRIEFING_TIME_ZONE. */
export const organizationSettingsInputSchema = z.object({
  unitSystem: unitSystemSchema,
  timeZone: timeZoneSchema.nullable(),
});
export type OrganizationSettingsInput = z.infer<typeof organizationSettingsInputSchema>;

export const organizationSettingsSchema = organizationSettingsInputSchema.extend({
  /** The deployment's zone, used while `timeZone` is null. */
  defaultTimeZone: z.string(),
  /** The zone in force: `timeZone ?? defaultTimeZone`. */
  effectiveTimeZone: z.string(),
});
export type OrganizationSettings = z.infer<typeof organizationSettingsSchema>;
