// One sentence for any failure, as the panels show it.
import { ApiError } from '@/api/api-error';

export function messageOf(e: unknown): string {
  if (e instanceof ApiError) return e.message;
  if (e instanceof Error) return e.message;
  return String(e);
}
