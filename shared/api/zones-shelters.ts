// Zones (where evacuees leave from) and shelters or exits (where they go), as the endpoints and
// the workspace forms exchange them. Attributes are defined in ./network.
import { z } from 'zod';
import { lonLatSchema } from './road-attributes';
import { shelterAttributesSchema, zoneAttributesSchema } from './zone-shelter-attributes';

function ringClosed(ring: [number, number][]): boolean {
  const first = ring[0];
  const last = ring[ring.length - 1];
  return first !== undefined && last !== undefined && first[0] === last[0] && first[1] === last[1];
}

const ringSchema = z
  .array(lonLatSchema)
  .min(4, 'A polygon ring needs at least 4 positions (the first repeated at the end).')
  .refine(ringClosed, 'A polygon ring must end where it starts.');

export const polygonSchema = z.object({ type: z.literal('Polygon'), coordinates: z.array(ringSchema).min(1) });
export const multiPolygonSchema = z.object({ type: z.literal('MultiPolygon'), coordinates: z.array(z.array(ringSchema).min(1)).min(1) });
export const zoneGeometrySchema = z.discriminatedUnion('type', [polygonSchema, multiPolygonSchema]);
export type ZoneGeometry = z.infer<typeof zoneGeometrySchema>;

export const zoneCreateSchema = zoneAttributesSchema.extend({ geometry: zoneGeometrySchema });
export type ZoneCreate = z.infer<typeof zoneCreateSchema>;
export const zoneUpdateSchema = zoneCreateSchema.partial().refine((v) => Object.keys(v).length > 0, 'Nothing to change.');
export type ZoneUpdate = z.infer<typeof zoneUpdateSchema>;
export const zoneSchema = zoneCreateSchema.extend({ id: z.number().int() });
export type Zone = z.infer<typeof zoneSchema>;
export const zoneListSchema = z.object({ zones: z.array(zoneSchema) });

export const shelterCreateSchema = shelterAttributesSchema.extend({
  lon: z.number().min(-180).max(180),
  lat: z.number().min(-90).max(90),
});
export type ShelterCreate = z.infer<typeof shelterCreateSchema>;
export const shelterUpdateSchema = shelterCreateSchema.partial().refine((v) => Object.keys(v).length > 0, 'Nothing to change.');
export type ShelterUpdate = z.infer<typeof shelterUpdateSchema>;
export const shelterSchema = shelterCreateSchema.extend({ id: z.number().int() });
export type Shelter = z.infer<typeof shelterSchema>;
export const shelterListSchema = z.object({ shelters: z.array(shelterSchema) });

export const zoneParamsSchema = z.object({ planId: z.string().uuid(), zoneId: z.coerce.number().int().positive() });
export const shelterParamsSchema = z.object({ planId: z.string().uuid(), shelterId: z.coerce.number().int().positive() });

/** Which road nodes each zone feeds and each shelter takes from, on the active road layer. */
export const attachmentsSchema = z.object({
  zones: z.array(
    z.object({
      zoneId: z.number().int(),
      attachedBy: z.enum(['inside', 'nearest']),
      distanceMeters: z.number(),
      nodes: z.array(z.object({ index: z.number().int(), lon: z.number(), lat: z.number() })),
      problem: z.string().nullable(),
    }),
  ),
  shelters: z.array(
    z.object({
      shelterId: z.number().int(),
      distanceMeters: z.number(),
      node: z.object({ index: z.number().int(), lon: z.number(), lat: z.number() }).nullable(),
      problem: z.string().nullable(),
    }),
  ),
});
export type Attachments = z.infer<typeof attachmentsSchema>;
