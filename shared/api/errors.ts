// The one error envelope every API failure uses; the client parses it with this schema.
import { z } from 'zod';
import { importFailureSchema } from './road-import';

export const errorCodeSchema = z.enum([
  'invalid_request',
  'unauthenticated',
  'forbidden',
  'not_found',
  'conflict',
  'csrf',
  'rate_limited',
  'account_locked',
  'payload_too_large',
  'busy',
  'internal',
]);
export type ErrorCode = z.infer<typeof errorCodeSchema>;

export const fieldErrorSchema = z.object({ path: z.string(), message: z.string() });
export type FieldError = z.infer<typeof fieldErrorSchema>;

export const errorEnvelopeSchema = z.object({
  error: z.object({
    code: errorCodeSchema,
    message: z.string(),
    fields: z.array(fieldErrorSchema).optional(),
    // A refused road, zone or shelter upload: every bad feature, so the planner can fix the file.
    importFailure: importFailureSchema.optional(),
  }),
});
export type ErrorEnvelope = z.infer<typeof errorEnvelopeSchema>;
