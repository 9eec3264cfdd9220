// Batches: one scenario (or the base plan) run over a sweep of a parameter; start, list, read.
import { batchListSchema, batchSchema, type BatchCreate } from '@shared/api/sweeps';
import { request } from './http';

const base = (planId: string) => `/plans/${planId}/batches`;

export const listBatches = async (planId: string) => (await request('GET', base(planId), batchListSchema)).batches;
export const getBatch = (planId: string, batchId: string, signal?: AbortSignal) =>
  request('GET', `${base(planId)}/${batchId}`, batchSchema, undefined, { signal });
export const startBatch = (planId: string, input: BatchCreate) => request('POST', base(planId), batchSchema, input);
