// What the load clients send. Reads: the requests a planner's screens make, in the order each
// connection cycles through them. Writes: edits a planner makes (plan description, a scenario
// created and deleted, a segment's lanes), with the session's CSRF token. Starting runs is paced
// apart (run-starter.ts). Every request names its route so latencies can be told apart.
import type { AutocannonRequest } from 'autocannon';
import type { BenchSession } from './sign-in';

export type BenchFixture = {
  planId: string;
  /** A run of the plan that finished with a result. */
  finishedRunId: string;
  /** The road layer's extent as west,south,east,north, as the workspace map first shows it. */
  bbox: string;
  /** Two-way segments whose lanes the writes change. */
  twoWaySegmentIds: number[];
};

export type NamedRequest = AutocannonRequest & { route: string };

const pick = <T>(xs: readonly T[]): T => xs[Math.floor(Math.random() * xs.length)]!;

// The web-map (XYZ, spherical Mercator) tile holding the centre of `bbox` at zoom z (common practice).
function roadTileAtCentre(bbox: string, z: number): string {
  const [w, s, e, n] = bbox.split(',').map(Number) as [number, number, number, number];
  const lon = (w + e) / 2;
  const lat = ((s + n) / 2) * (Math.PI / 180);
  const tiles = 2 ** z;
  return `${z}/${Math.floor(((lon + 180) / 360) * tiles)}/${Math.floor(((1 - Math.log(Math.tan(lat) + 1 / Math.cos(lat)) / Math.PI) / 2) * tiles)}`;
}

export function readRequests(f: BenchFixture): NamedRequest[] {
  const plan = `/api/plans/${f.planId}`;
  const get = (route: string, path: string): NamedRequest => ({ route, method: 'GET', path });
  return [
    get('GET /api/auth/session', '/api/auth/session'),
    get('GET /api/plans', '/api/plans'),
    get('GET /api/plans/:id', plan),
    get('GET …/road-layer', `${plan}/road-layer`),
    get('GET …/zones', `${plan}/zones`),
    get('GET …/shelters', `${plan}/shelters`),
    get('GET …/scenarios', `${plan}/scenarios`),
    get('GET …/runs', `${plan}/runs`),
    get('GET …/runs/:runId', `${plan}/runs/${f.finishedRunId}`),
    get('GET …/segments?page=1', `${plan}/segments?page=1`),
    get('GET …/tiles/roads/:z/:x/:y', `${plan}/tiles/roads/${roadTileAtCentre(f.bbox, 14)}`),
    get('GET /api/briefings', '/api/briefings'),
  ];
}

export function writeRequests(f: BenchFixture): NamedRequest[] {
  const plan = `/api/plans/${f.planId}`;
  const json = (body: unknown) => JSON.stringify(body);
  const stamp = () => `${Date.now().toString(36)}-${Math.random().toString(36).slice(2, 8)}`;
  return [
    {
      route: 'PATCH /api/plans/:id',
      method: 'PATCH',
      path: plan,
      setupRequest: (r) => ({ ...r, body: json({ description: `Bench edit ${stamp()}: the river crossings under load.` }) }),
    },
    {
      route: 'POST …/scenarios',
      method: 'POST',
      path: `${plan}/scenarios`,
      setupRequest: (r) => ({ ...r, body: json({ name: `Bench scenario ${stamp()}`, description: 'Created and deleted by the HTTP bench.' }) }),
      onResponse: (status, body, context) => {
        context.scenarioId = status === 201 ? (JSON.parse(body) as { id: string }).id : undefined;
      },
    },
    {
      // A failed create leaves no id: the path then names no scenario and the answer counts as non-2xx.
      route: 'DELETE …/scenarios/:scenarioId',
      method: 'DELETE',
      path: `${plan}/scenarios/none`,
      setupRequest: (r, context) => ({ ...r, path: `${plan}/scenarios/${String(context.scenarioId ?? 'none')}` }),
    },
    {
      route: 'PATCH …/segments/:segmentId',
      method: 'PATCH',
      path: `${plan}/segments/${f.twoWaySegmentIds[0]}`,
      setupRequest: (r) => {
        const lanes = pick([1, 2]);
        return { ...r, path: `${plan}/segments/${pick(f.twoWaySegmentIds)}`, body: json({ lanesForward: lanes, lanesBackward: lanes }) };
      },
    },
  ];
}

/**
 * The requests with one session's cookie (and, for writes, its CSRF token) on every one, and
 * the Accept-Encoding a browser sends.
 */
export function withSession(requests: NamedRequest[], session: BenchSession): NamedRequest[] {
  return requests.map((r) => ({
    ...r,
    headers: {
      ...r.headers,
      cookie: session.cookie,
      'accept-encoding': 'gzip, deflate, br',
      ...(r.method === 'GET' ? {} : { 'x-csrf-token': session.csrfToken, 'content-type': 'application/json' }),
    },
  }));
}
