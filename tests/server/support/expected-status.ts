// The status each caller should get from a route, written per row of the authorization table.
// Signed out is 401; a role without the route's permission is 403 in either organization (the
// permission is checked before the record is looked up). A role with it gets `ok` at home; in
// the other organization it gets 404 where the route names a record of the demo organization,
// and `ok` where the route works on the caller's own organization's records.
import type { Role } from '../../../shared/api/roles';
import { callers, roles, type Caller } from './callers';

export type Expected = Partial<Record<Caller, number>>;

/** 'record': the route names a demo organization's record; 'own': it works on the caller's own organization. */
export type Reach = 'record' | 'own';

function allowing(allowed: readonly Role[], ok: number, reach: Reach): Expected {
  const expected: Expected = { 'signed out': 401 };
  for (const role of roles) {
    expected[role] = allowed.includes(role) ? ok : 403;
    expected[`other ${role}`] = !allowed.includes(role) ? 403 : reach === 'record' ? 404 : ok;
  }
  return expected;
}

export const readers = (ok: number, reach: Reach = 'record') => allowing(['admin', 'planner', 'official', 'viewer'], ok, reach);
export const writers = (ok: number, reach: Reach = 'record') => allowing(['admin', 'planner'], ok, reach);
export const adminsOnly = (ok: number, reach: Reach = 'record') => allowing(['admin'], ok, reach);
/** Officials decide on a sign-off request; only the asked one may, so `ok` is for the demo official. */
export const signers = (ok: number) => allowing(['official'], ok, 'record');

/** Answers anyone, signed in or not, from either organization. */
export const publicRoute = (ok: number): Expected => Object.fromEntries(callers.map((c) => [c, ok]));

/** Only the other organization's callers: rows that try the demo organization's record through the caller's own plan. */
export function otherOrganizationOnly(expected: Expected): Expected {
  return Object.fromEntries(Object.entries(expected).filter(([c]) => c.startsWith('other '))) as Expected;
}
