// Shelters and exits of a plan: list, place (create), edit, delete, upload as GeoJSON points;
// and which road nodes zones and shelters attach to.
import { z } from 'zod';
import { attachmentsSchema, shelterListSchema, shelterSchema, type ShelterCreate, type ShelterUpdate } from '@shared/api/zones-shelters';
import { request } from './http';
import { uploadFile, type UploadProgress } from './upload';

const base = (planId: string) => `/plans/${planId}/shelters`;

export const listShelters = async (planId: string) => (await request('GET', base(planId), shelterListSchema)).shelters;
export const createShelter = (planId: string, input: ShelterCreate) => request('POST', base(planId), shelterSchema, input);
export const updateShelter = (planId: string, shelterId: number, input: ShelterUpdate) =>
  request('PATCH', `${base(planId)}/${shelterId}`, shelterSchema, input);
export const deleteShelter = (planId: string, shelterId: number) => request('DELETE', `${base(planId)}/${shelterId}`, z.undefined());

export const uploadShelters = (planId: string, file: File, onProgress?: (p: UploadProgress) => void) =>
  uploadFile(`${base(planId)}/upload`, file, shelterListSchema, { onProgress });

export const getAttachments = (planId: string) => request('GET', `/plans/${planId}/attachments`, attachmentsSchema);
