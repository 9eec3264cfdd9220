// Shelters and exits of a plan: list, place (create), edit, delete (files go up as import jobs, imports.ts);
// and which road nodes zones and shelters attach to.
import { z } from 'zod';
import { attachmentsSchema, shelterListSchema, shelterSchema, type ShelterCreate, type ShelterUpdate } from '@shared/api/zones-shelters';
import { request } from './http';

const base = (planId: string) => `/plans/${planId}/shelters`;

export const listShelters = async (planId: string) => (await request('GET', base(planId), shelterListSchema)).shelters;
export const createShelter = (planId: string, input: ShelterCreate) => request('POST', base(planId), shelterSchema, input);
export const updateShelter = (planId: string, shelterId: number, input: ShelterUpdate) =>
  request('PATCH', `${base(planId)}/${shelterId}`, shelterSchema, input);
export const deleteShelter = (planId: string, shelterId: number) => request('DELETE', `${base(planId)}/${shelterId}`, z.undefined());

export const getAttachments = (planId: string) => request('GET', `/plans/${planId}/attachments`, attachmentsSchema);
