// Paging for list routes: `?limit=&offset=`, capped per route so no request reads an unbounded
// table. The body stays the plain list; the `x-next-offset` header says where the next page
// starts and is absent on the last page. (Road segments page by page number for their table,
// the audit trail by id; both are capped as well.)
import { z } from 'zod';

export const nextOffsetHeader = 'x-next-offset';

const pageQuerySchemas = new Map<number, ReturnType<typeof buildPageQuerySchema>>();

// Built once per cap: building a zod schema costs more than parsing with it.
export function pageQuerySchema(maxLimit: number) {
  let schema = pageQuerySchemas.get(maxLimit);
  if (!schema) pageQuerySchemas.set(maxLimit, (schema = buildPageQuerySchema(maxLimit)));
  return schema;
}

function buildPageQuerySchema(maxLimit: number) {
  return z.object({
    limit: z.coerce.number().int('A whole number.').min(1).max(maxLimit, `At most ${maxLimit} at a time.`).default(maxLimit),
    offset: z.coerce.number().int('A whole number.').min(0).max(10_000_000).default(0),
  });
}
export type Page = z.infer<ReturnType<typeof pageQuerySchema>>;

// The caps, in one place so the client can page to the same sizes.
export const listCaps = {
  plans: 200,
  zones: 2000,
  shelters: 2000,
  scenarios: 200,
  runs: 200,
  sweeps: 100,
  proposals: 100,
  members: 500,
  briefings: 200,
  officials: 500,
  outbox: 200,
  capacityTableHistory: 200,
  mappingPresets: 200,
} as const;

/** Services fetch one row past the page, so the route knows whether another page follows. */
export const limitPlusOne = (page: Page) => page.limit + 1;
