// Map settings: the basemap is optional — with no tile URL the map shows the vector layers on a
// neutral background, so Cutline works offline.
import { z } from 'zod';

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
