// Map settings: the basemap is optional — with no tile URL the map shows the vector layers on a
// neutral background, so Cutline works offline.
import { z } from 'zod';

export const mapSettingsSchema = z.object({
  tileUrl: z
    .string()
    .trim()
    .max(500)
    .refine((u) => u === '' || /^https?:\/\/[^\s]+$/.test(u), 'Give an http(s) URL with {z}, {x} and {y}, or leave it empty.')
    .refine((u) => u === '' || (u.includes('{z}') && u.includes('{x}') && u.includes('{y}')), 'The URL needs {z}, {x} and {y} placeholders.'),
  attribution: z.string().trim().max(300),
});
export type MapSettings = z.infer<typeof mapSettingsSchema>;
