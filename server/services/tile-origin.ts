// The origin of a tile URL as a Content-Security-Policy host-source, or null. The origin enters
// the installation-wide img-src of every response, and helmet refuses the whole policy (every
// request fails, /healthz too) if a value holds "," or ";" — which `new URL` lets through in a
// host ("https://x,y/" has the origin "https://x,y"). So only host-shaped origins pass: http(s),
// DNS labels, an IPv4 address or a bracketed IPv6 address, an optional port; anything else is
// left out of the policy (the map then shows no tiles from it). Applies to values already
// stored, whatever the schema accepted when they were written.

const LABEL = '[a-z0-9](?:[a-z0-9-]{0,61}[a-z0-9])?';
const HOST = `(?:${LABEL}(?:\\.${LABEL})*|\\[[0-9a-f:.]+\\])`;
const HOST_SOURCE = new RegExp(`^https?://${HOST}(?::\\d{1,5})?$`);

export function cspImageOrigin(tileUrl: string): string | null {
  if (!tileUrl) return null;
  let origin: string;
  try {
    // {z}/{x}/{y} and the subdomain placeholder {s} stand for one letter or number each.
    origin = new URL(tileUrl.replaceAll(/\{[a-z]\}/g, 'a')).origin;
  } catch {
    return null;
  }
  return origin.length <= 300 && HOST_SOURCE.test(origin) ? origin : null;
}

