// Device cookies (OWASP, "Slow Down Online Guessing Attacks with Device Cookies"): a browser
// that has signed in to an account gets a signed cookie naming that account. The account
// lockout, which anyone who knows an address can trigger, does not apply to such a browser, so
// a stranger cannot lock a person out of their own browser, however often they renew the lock;
// attempts from anywhere else still meet it. The cookie holds no secret of the account and
// grants nothing by itself: the password is still checked, and the rate limits still count.
import { createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import type { CookieOptions, Request, Response } from 'express';
import { cookieValue } from './cookies';

export const DEVICE_COOKIE = 'cutline.device';
const MAX_AGE_DAYS = 180;

function signature(payload: string, secret: string): string {
  return createHmac('sha256', `device-cookie:${secret}`).update(payload).digest('base64url');
}

export function setDeviceCookie(res: Response, userId: string, secret: string, secure: boolean): void {
  const payload = Buffer.from(JSON.stringify({ u: userId, t: Date.now(), n: randomBytes(9).toString('base64url') })).toString('base64url');
  const options: CookieOptions = { httpOnly: true, sameSite: 'lax', secure, maxAge: MAX_AGE_DAYS * 86_400_000, path: '/api/auth' };
  res.cookie(DEVICE_COOKIE, `${payload}.${signature(payload, secret)}`, options);
}

/** True when the request carries a device cookie this server signed for this account, not too old. */
export function deviceKnownFor(req: Request, userId: string, secret: string): boolean {
  const value = cookieValue(req, DEVICE_COOKIE);
  if (!value || value.length > 512) return false;
  const [payload, mac] = value.split('.');
  if (!payload || !mac) return false;
  const expected = Buffer.from(signature(payload, secret));
  const given = Buffer.from(mac);
  if (expected.length !== given.length || !timingSafeEqual(expected, given)) return false;
  try {
    const { u, t } = JSON.parse(Buffer.from(payload, 'base64url').toString('utf8')) as { u?: unknown; t?: unknown };
    return u === userId && typeof t === 'number' && Date.now() - t < MAX_AGE_DAYS * 86_400_000;
  } catch {
    return false;
  }
}
