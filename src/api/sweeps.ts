// Sweeps: one scenario (or the base plan) run over a sweep of a parameter; start, list, read.
import { sweepListSchema, sweepSchema, type SweepCreate } from '@shared/api/sweeps';
import { request } from './http';

const base = (planId: string) => `/plans/${planId}/sweeps`;

export const listSweeps = async (planId: string) => (await request('GET', base(planId), sweepListSchema)).sweeps;
export const getSweep = (planId: string, sweepId: string, signal?: AbortSignal) =>
  request('GET', `${base(planId)}/${sweepId}`, sweepSchema, undefined, { signal });
export const startSweep = (planId: string, input: SweepCreate) => request('POST', base(planId), sweepSchema, input);
