// Evacuation zones of a plan: list, draw (create), edit, delete, upload as GeoJSON.
import { z } from 'zod';
import { zoneListSchema, zoneSchema, type ZoneCreate, type ZoneUpdate } from '@shared/api/zones-shelters';
import { request } from './http';
import { uploadFile, type UploadProgress } from './upload';

const base = (planId: string) => `/plans/${planId}/zones`;

export const listZones = async (planId: string) => (await request('GET', base(planId), zoneListSchema)).zones;
export const createZone = (planId: string, input: ZoneCreate) => request('POST', base(planId), zoneSchema, input);
export const updateZone = (planId: string, zoneId: number, input: ZoneUpdate) => request('PATCH', `${base(planId)}/${zoneId}`, zoneSchema, input);
export const deleteZone = (planId: string, zoneId: number) => request('DELETE', `${base(planId)}/${zoneId}`, z.undefined());

// `defaulted` lists, per zone, the attributes the file left out (the defaults were applied).
const zoneUploadSchema = z.object({ zones: z.array(zoneSchema), defaulted: z.array(z.unknown()) });
export const uploadZones = (planId: string, file: File, onProgress?: (p: UploadProgress) => void) =>
  uploadFile(`${base(planId)}/upload`, file, zoneUploadSchema, { onProgress });
