// /api/plans/:planId/runs: start (202: recorded and queued; prepared and solved by a worker), list, poll, cancel, export.
import { Router } from 'express';
import { z } from 'zod';
import { runParametersSchema } from '../../shared/api/runs';
import { planParamsSchema } from '../../shared/api/plans';
import { chokePointsCsv, curveCsv } from '../../shared/model/run-export-csv';
import { csvComments } from '../../shared/model/csv';
import { identityLines, identityObject } from '../../shared/model/export-identity';
import { runExportIdentity } from '../services/export-identity';
import type { Config } from '../config';
import type { Database } from '../db/client';
import { ConflictError } from '../errors';
import { actorOf, requireMember } from '../middleware/require-member';
import { arcsGeoJson } from '../services/run-exports';
import { runResultsBundle } from '../services/run-results-export';
import { exportContentTypes } from '../export/write-export';
import { writeExportFile } from '../export/write-export-in-worker';
import { getRunHead, getRunRow, isFinishedRun, listRuns, markCancelled, runWithResultJson } from '../services/runs';
import { startRuns } from '../services/start-runs';
import type { RunEnqueuer } from '../queue/run-enqueuer';
import { listCaps } from '../../shared/api/pagination';
import { pageOf, sendPage } from '../http/list-page';
import type { AnswerCache } from '../http/answer-cache';

const runParamsSchema = z.object({ planId: z.string().uuid('Not a valid identifier.'), runId: z.string().uuid('Not a valid identifier.') });
const startRunSchema = z.object({ parameters: runParametersSchema, scenarioId: z.string().uuid('Not a valid identifier.').nullable().default(null) });

export function runsRouter(db: Database, config: Config, queue: RunEnqueuer, answers: AnswerCache): Router {
  const router = Router({ mergeParams: true });

  router.post('/runs', requireMember('plans:write'), async (req, res) => {
    const { planId } = planParamsSchema.parse(req.params);
    const started = await startRuns(db, queue, config, actorOf(req), planId, startRunSchema.parse(req.body));
    res.status(202).json(started.runs[0]);
  });

  router.get('/runs', requireMember('plans:read'), async (req, res) => {
    const { planId } = planParamsSchema.parse(req.params);
    const page = pageOf(req, listCaps.runs);
    sendPage(res, 'runs', await listRuns(db, actorOf(req).organizationId, planId, page), page);
  });

  router.get('/runs/:runId', requireMember('plans:read'), async (req, res) => {
    const { planId, runId } = runParamsSchema.parse(req.params);
    const run = await getRunHead(db, actorOf(req).organizationId, planId, runId);
    // A queued or running run has no result yet; a finished one never changes, so its answer,
    // keyed by everything it says besides the result, is kept ready.
    if (!isFinishedRun(run)) res.json({ ...run, result: null });
    else await answers.sendJson(req, res, `run ${JSON.stringify(run)}`, () => runWithResultJson(db, run));
  });

  router.post('/runs/:runId/cancel', requireMember('plans:write'), async (req, res) => {
    const { planId, runId } = runParamsSchema.parse(req.params);
    const actor = actorOf(req);
    await getRunRow(db, actor.organizationId, planId, runId);
    // The worker solving it notices the cancelled status and stops.
    res.json(await markCancelled(db, actor, planId, runId));
  });

  async function finishedResult(req: Parameters<Parameters<typeof router.get>[1]>[0]) {
    const { planId, runId } = runParamsSchema.parse(req.params);
    const { organizationId } = actorOf(req);
    const row = await getRunRow(db, organizationId, planId, runId);
    if (!row.result) throw new ConflictError(`The run has no result (it is ${row.status}).`);
    // Every export carries the caution and the run's identity and assumptions.
    const identity = (contents: string) => runExportIdentity(db, organizationId, planId, row, contents);
    return { row, result: row.result, identity };
  }

  router.get('/runs/:runId/export/choke-points.csv', requireMember('plans:read'), async (req, res) => {
    const { row, result, identity } = await finishedResult(req);
    const head = csvComments(identityLines(await identity('Run results: choke points')));
    res.attachment(`run-${row.id.slice(0, 8)}-choke-points.csv`).type('text/csv').send(head + chokePointsCsv(result));
  });

  router.get('/runs/:runId/export/curve.csv', requireMember('plans:read'), async (req, res) => {
    const { row, result, identity } = await finishedResult(req);
    const head = csvComments(identityLines(await identity('Run results: vehicles arrived over time')));
    res.attachment(`run-${row.id.slice(0, 8)}-curve.csv`).type('text/csv').send(head + curveCsv(result));
  });

  router.get('/runs/:runId/export/arcs.geojson', requireMember('plans:read'), async (req, res) => {
    const { row, identity } = await finishedResult(req);
    const collection = await arcsGeoJson(db, row.roadLayerId, row.id);
    // A foreign member (RFC 7946 §6.1): GIS tools keep or ignore it; the data stays plain GeoJSON.
    const body = { type: collection.type, cutline: identityObject(await identity('Run results: roads (each direction)')), features: collection.features };
    res.attachment(`run-${row.id.slice(0, 8)}-arcs.geojson`).type('application/geo+json').send(JSON.stringify(body));
  });

  // The results as one file of every table (roads, zones, shelters, curve).
  for (const [file, format] of [['results.gpkg', 'gpkg'], ['results.kml', 'kml']] as const) {
    router.get(`/runs/:runId/export/${file}`, requireMember('plans:read'), async (req, res) => {
      const { row, result } = await finishedResult(req);
      const { planId } = runParamsSchema.parse(req.params);
      const bundle = await runResultsBundle(db, actorOf(req).organizationId, planId, row, result, config.BRIEFING_TIME_ZONE);
      const bytes = await writeExportFile({ format, bundle });
      res.attachment(`run-${row.id.slice(0, 8)}-${file}`).type(exportContentTypes[format]).send(Buffer.from(bytes));
    });
  }

  return router;
}
