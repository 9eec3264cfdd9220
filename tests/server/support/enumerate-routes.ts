// Every route the API answers, read from the Express router itself, so a route added without a
// row in the tables that walk them (authorization, hostile bodies) fails those suites.
import type { Express } from 'express';

export type EnumeratedRoute = { method: 'get' | 'post' | 'put' | 'patch' | 'delete'; path: string };

type Layer = {
  rawPath?: string;
  route?: { path: string; methods: Record<string, boolean> };
  handle?: { stack?: Layer[] };
};

export function enumerateRoutes(app: Express): EnumeratedRoute[] {
  const found: EnumeratedRoute[] = [];
  const walk = (stack: Layer[], prefix: string) => {
    for (const layer of stack) {
      if (layer.route) {
        for (const [method, on] of Object.entries(layer.route.methods)) {
          if (on && method !== '_all') found.push({ method: method as EnumeratedRoute['method'], path: join(prefix, layer.route.path) });
        }
      } else if (layer.handle?.stack) {
        walk(layer.handle.stack, join(prefix, layer.rawPath ?? ''));
      }
    }
  };
  walk((app as unknown as { router: { stack: Layer[] } }).router.stack, '');
  return found;
}

function join(a: string, b: string): string {
  const joined = `${a}/${b}`.replace(/\/+/g, '/');
  return joined.length > 1 ? joined.replace(/\/$/, '') : joined;
}

export const routeKey = (r: EnumeratedRoute) => `${r.method.toUpperCase()} ${r.path}`;
