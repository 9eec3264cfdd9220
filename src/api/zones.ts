// Evacuation zones of a plan: list, draw (create), edit, delete. Files are uploaded as import jobs (imports.ts).
import { z } from 'zod';
import { zoneListSchema, zoneSchema, type ZoneCreate, type ZoneUpdate } from '@shared/api/zones-shelters';
import { request } from './http';

const base = (planId: string) => `/plans/${planId}/zones`;

export const listZones = async (planId: string) => (await request('GET', base(planId), zoneListSchema)).zones;
export const createZone = (planId: string, input: ZoneCreate) => request('POST', base(planId), zoneSchema, input);
export const updateZone = (planId: string, zoneId: number, input: ZoneUpdate) => request('PATCH', `${base(planId)}/${zoneId}`, zoneSchema, input);
export const deleteZone = (planId: string, zoneId: number) => request('DELETE', `${base(planId)}/${zoneId}`, z.undefined());
