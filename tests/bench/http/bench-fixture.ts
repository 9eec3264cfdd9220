// What the load needs to know about the seeded demo plan, found through the API as a client
// would: the plan, its road layer's extent, two-way segments to edit, and one finished run
// (started here and solved by the worker, so GET …/runs/:runId returns a real result).
import type { z } from 'zod';
import { planListSchema } from '../../../shared/api/plans';
import { roadLayerResponseSchema, segmentPageSchema } from '../../../shared/api/road-layers';
import { runSchema, runWithResultSchema } from '../../../shared/api/runs';
import { demoPlanName } from '../../../server/seed/seed-demo';
import type { BenchFixture } from './load-mix';
import type { BenchSession } from './sign-in';

async function getJson<S extends z.ZodType>(url: string, session: BenchSession, schema: S): Promise<z.output<S>> {
  const res = await fetch(url, { headers: { cookie: session.cookie } });
  if (!res.ok) throw new Error(`GET ${url} answered ${res.status}: ${await res.text()}`);
  return schema.parse(await res.json());
}

export async function prepareFixture(baseUrl: string, planner: BenchSession, runTimeoutMs: number): Promise<BenchFixture & { firstRunSeconds: number }> {
  const { plans } = await getJson(`${baseUrl}/api/plans`, planner, planListSchema);
  const plan = plans.find((p) => p.name === demoPlanName);
  if (!plan) throw new Error('the demo plan is not seeded');
  const base = `${baseUrl}/api/plans/${plan.id}`;
  const { layer } = await getJson(`${base}/road-layer`, planner, roadLayerResponseSchema);
  if (!layer?.bbox) throw new Error('the demo plan has no road layer');

  const twoWaySegmentIds: number[] = [];
  for (let page = 1; twoWaySegmentIds.length < 100; page++) {
    const { items } = await getJson(`${base}/segments?page=${page}&pageSize=500`, planner, segmentPageSchema);
    if (items.length === 0) break;
    twoWaySegmentIds.push(...items.filter((s) => !s.oneway && !s.bridge && s.roadClass === 'residential').map((s) => s.id));
  }
  if (twoWaySegmentIds.length === 0) throw new Error('the demo plan has no two-way residential segments');

  const started = await fetch(`${base}/runs`, {
    method: 'POST',
    headers: { cookie: planner.cookie, 'x-csrf-token': planner.csrfToken, 'content-type': 'application/json' },
    body: JSON.stringify({ parameters: { horizonMinutes: 360, timeStepSeconds: 60, capacityFactor: 1, algorithm: 'auto' } }),
  });
  if (started.status !== 202) throw new Error(`starting the first run answered ${started.status}: ${await started.text()}`);
  const { id } = runSchema.parse(await started.json());
  const t0 = Date.now();
  for (;;) {
    const run = await getJson(`${base}/runs/${id}`, planner, runWithResultSchema);
    if (run.status === 'succeeded' && run.result) break;
    if (run.status === 'failed' || run.status === 'cancelled') throw new Error(`the first run ${run.status}: ${run.failureReason ?? ''}`);
    if (Date.now() - t0 > runTimeoutMs) throw new Error(`the first run did not finish within ${runTimeoutMs / 1000} s (is the worker running?)`);
    await new Promise((r) => setTimeout(r, 250));
  }
  return {
    planId: plan.id,
    finishedRunId: id,
    bbox: layer.bbox.join(','),
    twoWaySegmentIds: twoWaySegmentIds.slice(0, 100),
    firstRunSeconds: (Date.now() - t0) / 1000,
  };
}
