// Reads a list route's page from the query and answers with it: services fetch one row more
// than the limit, so a further page is known without counting the table.
import type { Request, Response } from 'express';
import { nextOffsetHeader, pageQuerySchema, type Page } from '../../shared/api/pagination';

export function pageOf(req: Request, maxLimit: number): Page {
  return pageQuerySchema(maxLimit).parse(req.query);
}

/** Rows fetched with `limitPlusOne(page)` (shared/api/pagination.ts); sends `{ ...others, [key]: rows }` trimmed to the page. */
export function sendPage<T>(res: Response, key: string, rows: T[], page: Page, others: Record<string, unknown> = {}): void {
  if (rows.length > page.limit) res.setHeader(nextOffsetHeader, String(page.offset + page.limit));
  res.json({ ...others, [key]: rows.slice(0, page.limit) });
}
