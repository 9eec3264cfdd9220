// The plan's road layer: summary and import report, segments for the map and the table, edits.
import { z } from 'zod';
import type { ImportOptionsInput } from '@shared/api/road-import';
import type { SegmentAttributesPatch } from '@shared/api/road-attributes';
import {
  roadLayerResponseSchema,
  segmentPageSchema,
  segmentSchema,
  type SegmentPageQuery,
} from '@shared/api/road-layers';
import { request } from './http';
import type { UploadProgress } from './upload';
import { importFile } from './imports';

const base = (planId: string) => `/plans/${planId}`;

export const getRoadLayer = async (planId: string) => (await request('GET', `${base(planId)}/road-layer`, roadLayerResponseSchema)).layer;

/** Uploads a road file as a queued import, follows it to its end, and answers with the new layer. */
export async function uploadRoadLayer(
  planId: string,
  file: File,
  options: {
    name?: string;
    importOptions?: ImportOptionsInput;
    onProgress?: (p: UploadProgress) => void;
    onServerProgress?: (phase: string, share: number) => void;
    signal?: AbortSignal;
  } = {},
) {
  const fields: Record<string, string> = {};
  if (options.name) fields.name = options.name;
  if (options.importOptions) fields.options = JSON.stringify(options.importOptions);
  await importFile(planId, 'road-layer', file, { fields, onProgress: options.onProgress, onServerProgress: options.onServerProgress, signal: options.signal });
  return { layer: await getRoadLayer(planId) };
}

export function segmentPageSearch(query: SegmentPageQuery): string {
  const params = new URLSearchParams();
  for (const [key, value] of Object.entries(query)) {
    if (value !== undefined && value !== null && value !== '') params.set(key, String(value));
  }
  return params.toString();
}

export const listSegments = (planId: string, query: SegmentPageQuery, signal?: AbortSignal) =>
  request('GET', `${base(planId)}/segments?${segmentPageSearch(query)}`, segmentPageSchema, undefined, { signal });

export const getSegment = (planId: string, segmentId: number) => request('GET', `${base(planId)}/segments/${segmentId}`, segmentSchema);

export const updateSegment = (planId: string, segmentId: number, patch: SegmentAttributesPatch) =>
  request('PATCH', `${base(planId)}/segments/${segmentId}`, segmentSchema, patch);

export const updateSegments = (planId: string, ids: number[], patch: SegmentAttributesPatch) =>
  request('PATCH', `${base(planId)}/segments`, z.object({ updated: z.number().int() }), { ids, patch });
