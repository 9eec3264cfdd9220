// Signed-in sessions for the load: each is the session cookie and its CSRF token, got the way
// the client gets them (GET /api/auth/session for a first token, then POST /api/auth/sign-in).
import { sessionResponseSchema } from '../../../shared/api/auth';
import type { Role } from '../../../shared/api/roles';

export type BenchSession = { email: string; role: Role; cookie: string; csrfToken: string };

// Signed out the CSRF token is held in the `cutline.csrf` cookie; signed in, in the session.
function cookieNamed(res: Response, name: 'cutline.csrf' | 'cutline.sid'): string {
  const set = res.headers.getSetCookie().find((c) => c.startsWith(`${name}=`));
  if (!set) throw new Error(`no ${name} cookie in the answer to ${res.url}`);
  return set.split(';')[0]!;
}

export async function signIn(baseUrl: string, email: string, password: string): Promise<BenchSession> {
  const first = await fetch(`${baseUrl}/api/auth/session`);
  const anonymous = sessionResponseSchema.parse(await first.json());
  const res = await fetch(`${baseUrl}/api/auth/sign-in`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', cookie: cookieNamed(first, 'cutline.csrf'), 'x-csrf-token': anonymous.csrfToken },
    body: JSON.stringify({ email, password }),
  });
  if (res.status !== 200) throw new Error(`sign-in of ${email} failed: ${res.status} ${await res.text()}`);
  const body = sessionResponseSchema.parse(await res.json());
  if (!body.user) throw new Error(`sign-in of ${email} returned no user`);
  return { email, role: body.user.role, cookie: cookieNamed(res, 'cutline.sid'), csrfToken: body.csrfToken };
}

/** `times` sessions of every account, signed in one after another (bcrypt is the cost). */
export async function signInAll(baseUrl: string, accounts: { email: string; password: string }[], times: number): Promise<BenchSession[]> {
  const sessions: BenchSession[] = [];
  for (let i = 0; i < times; i++) for (const a of accounts) sessions.push(await signIn(baseUrl, a.email, a.password));
  return sessions;
}
