// Where the CSRF token is kept (csrf-sync's state). Signed in: in the session, a synchroniser
// token. Signed out: in a signed, httpOnly, SameSite=Strict cookie (a signed double-submit
// token), so that an anonymous GET /api/auth/session (every visit, every probe, every script
// without a cookie jar) writes no session row: before, each such call stored a session only to
// hold its token. Sign-in (which needs the token) regenerates the session, and from then on the
// token lives there. Under Secure cookies the name takes the __Host- prefix, so a neighbouring
// subdomain cannot plant one.
import { createHmac, timingSafeEqual } from 'node:crypto';
import type { CookieOptions, Request } from 'express';
import { cookieValue } from './cookies';

const baseName = 'cutline.csrf';
export const csrfCookieName = (secure: boolean) => (secure ? `__Host-${baseName}` : baseName);

function mac(token: string, secret: string): string {
  return createHmac('sha256', `csrf-cookie:${secret}`).update(token).digest('base64url');
}

export function csrfState(secret: string, secure: boolean) {
  const name = csrfCookieName(secure);
  const options: CookieOptions = { httpOnly: true, sameSite: 'strict', secure, path: '/' };
  const signedIn = (req: Request) => typeof req.isAuthenticated === 'function' && req.isAuthenticated();

  function tokenFromCookie(req: Request): string | undefined {
    const value = cookieValue(req, name);
    if (!value || value.length > 256) return undefined;
    const dot = value.lastIndexOf('.');
    if (dot <= 0) return undefined;
    const token = value.slice(0, dot);
    const expected = Buffer.from(mac(token, secret));
    const given = Buffer.from(value.slice(dot + 1));
    return expected.length === given.length && timingSafeEqual(expected, given) ? token : undefined;
  }

  return {
    getTokenFromState: (req: Request): string | null | undefined => (signedIn(req) ? req.session.csrfToken : tokenFromCookie(req)),
    storeTokenInState: (req: Request, token?: string | null): void => {
      if (signedIn(req)) {
        req.session.csrfToken = token;
        return;
      }
      // As express-session does for its own cookie: a Secure cookie is not sent over plain HTTP.
      if (secure && !req.secure) return;
      if (token) req.res?.cookie(name, `${token}.${mac(token, secret)}`, options);
      else req.res?.clearCookie(name, options);
    },
  };
}
