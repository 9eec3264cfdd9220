// Who calls the API in the authorization table: nobody signed in, each role of the demo
// organization (whose records the table's routes name), and each role of Far County.
import request from 'supertest';
import type { Role } from '../../../shared/api/roles';
import { csrfFor, signIn, accountFor, type SignedInAgent, type TestContext } from './test-app';
import { farCountyAccounts } from './far-county';

export const roles = ['admin', 'planner', 'official', 'viewer'] as const satisfies readonly Role[];

export type Caller = 'signed out' | Role | `other ${Role}`;

export const callers: readonly Caller[] = ['signed out', ...roles, ...roles.map((r) => `other ${r}` as const)];

export const isOtherOrganization = (c: Caller): c is `other ${Role}` => c.startsWith('other ');

export function roleOf(c: Caller): Role | null {
  if (c === 'signed out') return null;
  return (isOtherOrganization(c) ? c.slice('other '.length) : c) as Role;
}

export function accountOf(c: Caller): { email: string; password: string } | null {
  const role = roleOf(c);
  if (!role) return null;
  if (!isOtherOrganization(c)) return accountFor(role);
  return farCountyAccounts.find((a) => a.role === role)!;
}

/** A new session for the caller: signed in as them, or anonymous with a valid CSRF token (so refusals are 401, not the CSRF 403). */
export async function sessionFor(app: TestContext['app'], c: Caller): Promise<SignedInAgent> {
  const account = accountOf(c);
  if (account) return signIn(app, account.email, account.password);
  const agent = request.agent(app);
  return { agent, csrf: await csrfFor(agent) };
}
