// Reading one cookie from the request header, for the few cookies the server signs itself
// (express-session parses its own).
import type { Request } from 'express';

/** The named cookie's decoded value, or null when absent or not decodable. */
export function cookieValue(req: Request, name: string): string | null {
  const header = req.headers.cookie;
  if (!header) return null;
  for (const part of header.split(';')) {
    const eq = part.indexOf('=');
    if (eq > 0 && part.slice(0, eq).trim() === name) {
      try {
        return decodeURIComponent(part.slice(eq + 1).trim());
      } catch {
        return null;
      }
    }
  }
  return null;
}
