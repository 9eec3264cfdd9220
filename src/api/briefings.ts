// Briefings: list, draft, sign-off, sign or return, versions, PDFs, verification, outbox.
import { z } from 'zod';
import {
  briefingDetailSchema,
  briefingListSchema,
  briefingStepResponseSchema,
  officialListSchema,
  outboxListSchema,
  outboxMessageSchema,
  verificationSchema,
  type BriefingCreate,
  type BriefingUpdate,
  type BriefingVersionCreate,
  type SignOffRequest,
} from '@shared/api/briefings';
import { request } from './http';
import { uploadFile } from './upload';

export const listBriefings = async (planId?: string) =>
  (await request('GET', `/briefings${planId ? `?planId=${encodeURIComponent(planId)}` : ''}`, briefingListSchema)).briefings;
export const getBriefing = (id: string) => request('GET', `/briefings/${id}`, briefingDetailSchema);
export const createBriefing = (input: BriefingCreate) => request('POST', '/briefings', briefingStepResponseSchema, input);
export const updateBriefing = (id: string, input: BriefingUpdate) => request('PATCH', `/briefings/${id}`, briefingStepResponseSchema, input);
export const deleteBriefing = (id: string) => request('DELETE', `/briefings/${id}`, z.undefined());
export const createBriefingVersion = (id: string, input: BriefingVersionCreate = {}) => request('POST', `/briefings/${id}/versions`, briefingStepResponseSchema, input);
export const requestSignOff = (id: string, input: SignOffRequest) => request('POST', `/briefings/${id}/sign-off-requests`, briefingStepResponseSchema, input);
export const withdrawSignOffRequest = (id: string) => request('POST', `/briefings/${id}/withdraw`, briefingStepResponseSchema);
export const signBriefing = (id: string) => request('POST', `/briefings/${id}/sign`, briefingStepResponseSchema);
export const returnBriefing = (id: string, comment: string) => request('POST', `/briefings/${id}/return`, briefingStepResponseSchema, { comment });
export const distributeBriefing = (id: string) => request('POST', `/briefings/${id}/distribute`, briefingStepResponseSchema);
export const listOfficials = async () => (await request('GET', '/briefings/officials', officialListSchema)).officials;

/** Verification of a PDF someone holds: open to everyone, signed in or not. */
export const verifyBriefingFile = (file: File) => uploadFile('/briefings/verify', file, verificationSchema);

export const listOutbox = () => request('GET', '/briefings/outbox', outboxListSchema);
export const getOutboxMessage = (id: number) => request('GET', `/briefings/outbox/${id}`, outboxMessageSchema);
export const outboxAttachmentUrl = (messageId: number, index: number) => `/api/briefings/outbox/${messageId}/attachments/${index}`;

/** Plain links: the browser fetches them with the session cookie (the frame shows it, a download saves it). */
export function briefingPdfUrl(id: string, options: { file?: 'draft' | 'signed'; download?: boolean } = {}): string {
  const query = new URLSearchParams();
  if (options.file) query.set('file', options.file);
  if (options.download) query.set('download', '1');
  const q = query.toString();
  return `/api/briefings/${id}/pdf${q ? `?${q}` : ''}`;
}
