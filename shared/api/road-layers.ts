// The road-layer endpoints: the active layer's summary, segments for the map and the table,
// and planners' edits. Attributes and the import report are defined in ./network.
import { z } from 'zod';
import { importReportSchema } from './road-import';
import { roadClassSchema, segmentAttributesObjectSchema } from './road-attributes';

export const roadLayerSchema = z.object({
  id: z.number().int(),
  planId: z.string().uuid(),
  name: z.string(),
  sourceFileName: z.string(),
  nodeCount: z.number().int(),
  segmentCount: z.number().int(),
  report: importReportSchema,
  // [minLon, minLat, maxLon, maxLat]
  bbox: z.tuple([z.number(), z.number(), z.number(), z.number()]).nullable(),
  createdAt: z.string(),
});
export type RoadLayer = z.infer<typeof roadLayerSchema>;

export const roadLayerResponseSchema = z.object({ layer: roadLayerSchema.nullable() });

export const segmentSchema = segmentAttributesObjectSchema.extend({
  id: z.number().int(),
  fromNode: z.number().int(),
  toNode: z.number().int(),
  lengthMeters: z.number(),
  component: z.number().int(),
  sourceId: z.string().nullable(),
});
export type Segment = z.infer<typeof segmentSchema>;

export const segmentSortKeys = ['id', 'name', 'roadClass', 'lanesForward', 'lanesBackward', 'speedKmh', 'lengthMeters', 'closed'] as const;

export const segmentPageQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(500).default(50),
  sortBy: z.enum(segmentSortKeys).default('id'),
  sortOrder: z.enum(['asc', 'desc']).default('asc'),
  roadClass: roadClassSchema.optional(),
  name: z.string().max(200).optional(),
  closed: z.enum(['true', 'false']).transform((v) => v === 'true').optional(),
  bridge: z.enum(['true', 'false']).transform((v) => v === 'true').optional(),
});
export type SegmentPageQuery = z.input<typeof segmentPageQuerySchema>;

export const segmentPageSchema = z.object({ items: z.array(segmentSchema), total: z.number().int() });
export type SegmentPage = z.infer<typeof segmentPageSchema>;

export const segmentParamsSchema = z.object({
  planId: z.string().uuid('Not a valid identifier.'),
  segmentId: z.coerce.number().int().positive(),
});

export const segmentBulkUpdateSchema = z.object({
  ids: z.array(z.number().int().positive()).min(1, 'Select at least one segment.').max(10_000),
  patch: segmentAttributesObjectSchema.partial().refine((p) => Object.keys(p).length > 0, 'Nothing to change.'),
});
export type SegmentBulkUpdate = z.infer<typeof segmentBulkUpdateSchema>;

