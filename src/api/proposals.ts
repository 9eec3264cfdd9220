// Searches for the best change (proposals) of a plan: start, list, poll, cancel, save as a scenario.
import { z } from 'zod';
import { proposalSchema, type ProposalRequest } from '@shared/api/proposals';
import { scenarioSchema } from '@shared/api/scenarios';
import { request } from './http';

const base = (planId: string) => `/plans/${planId}/proposals`;

export const startProposal = (planId: string, body: ProposalRequest) => request('POST', base(planId), proposalSchema, body);
export const listProposals = async (planId: string) => (await request('GET', base(planId), z.object({ proposals: z.array(proposalSchema) }))).proposals;
export const getProposal = (planId: string, id: string) => request('GET', `${base(planId)}/${id}`, proposalSchema);
export const cancelProposal = (planId: string, id: string) => request('POST', `${base(planId)}/${id}/cancel`, proposalSchema);
export const saveProposal = (planId: string, id: string, name: string, segmentId?: number) =>
  request('POST', `${base(planId)}/${id}/scenario`, scenarioSchema, { name, segmentId });
export const zoneRoutesCsvUrl = (planId: string, id: string) => `/api${base(planId)}/${id}/export/zone-routes.csv`;
