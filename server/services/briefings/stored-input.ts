// A briefing's stored content (the JSON its footer hash is computed from) back into the
// renderer's input, with the status-dependent parts (sign-off, return comment) added. Checks
// that the content still hashes to the recorded value: a row edited behind the app's back
// would otherwise be rendered, and signed, with figures nobody reviewed.
import type { UnitSystem } from '../../../shared/api/units';
import type { BriefingInput, BriefingReturn, BriefingSignature, BriefingStatus } from './briefing-input';
import { contentSha256, sha256OfStoredContent, type StoredBriefingContent } from './content-fingerprint';

export class ContentMismatchError extends Error {}

export type RenderState = {
  status: BriefingStatus;
  signature?: BriefingSignature | undefined;
  returned?: BriefingReturn | undefined;
  timeZone: string;
  unitSystem?: UnitSystem | undefined;
  verificationUrl: string;
};

export function inputFromStored(content: StoredBriefingContent, recordedSha256: string, state: RenderState): BriefingInput {
  if (sha256OfStoredContent(content) !== recordedSha256) throw new ContentMismatchError(`the stored content of briefing ${content.briefingId} does not match its recorded SHA-256`);
  const { format: _format, createdAt, ...rest } = content as StoredBriefingContent & { createdAt: string };
  const input = {
    ...(rest as unknown as Omit<BriefingInput, 'createdAt' | 'status' | 'timeZone'>),
    createdAt: new Date(createdAt),
    status: state.status,
    signature: state.signature,
    returned: state.returned,
    timeZone: state.timeZone,
    unitSystem: state.unitSystem,
    verificationUrl: state.verificationUrl,
  } satisfies BriefingInput;
  if (contentSha256(input) !== recordedSha256) throw new ContentMismatchError(`briefing ${content.briefingId} no longer renders to its recorded content`);
  return input;
}
