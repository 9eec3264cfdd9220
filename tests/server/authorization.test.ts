// Every API route, read from the router itself, against every caller: signed out, each role of
// the demo organization, each role of Far County. A route without a row, or a row naming a
// route that is gone, fails the suite. The records named are the demo organization's; Far
// County's members must get 404 for them (403 where their role lacks the permission, which is
// checked first), and nothing any of its members or a signed-out caller receives may contain
// a demo organization's id, name or address. A refused request must change nothing: the
// database is fingerprinted before and after each refused write.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startFakeSmtpServer, type FakeSmtpServer } from '../../server/services/briefings/mail/fake-smtp-server';
import { keepOutboxMessage } from '../../server/services/briefings/outbox';
import { importUploadsSettled } from '../../server/services/imports';
import { seedOrganization } from '../../server/seed/seed-organization';
import { defaultCapacityTable } from '../../shared/model/capacity-defaults';
import { createTestContext, type SignedInAgent, type TestContext } from './support/test-app';
import { enumerateRoutes, routeKey } from './support/enumerate-routes';
import { callers, accountOf, isOtherOrganization, sessionFor, type Caller } from './support/callers';
import { farCounty, farCountyAccounts } from './support/far-county';
import { adminsOnly, otherOrganizationOnly, publicRoute, readers, signers, writers, type Expected } from './support/expected-status';
import { binary, createFarPlan, createFixtures, shelterBody, smallRoadFile, zoneBody, type Fixtures } from './support/authorization-fixtures';
import { databaseFingerprint } from './support/database-fingerprint';

type Call = {
  params?: Record<string, string | number>;
  query?: string;
  body?: object;
  file?: { bytes: Buffer; name: string };
};

type Row = {
  /** The route as the router lists it: method and path pattern. */
  route: string;
  /** What this row tries, when a route has more than one row. */
  variant?: string;
  expect: Expected;
  /** Builds one caller's request; `succeeds` says whether it is expected to, so it can be given a record of its own to use up. */
  call?: (f: Fixtures, caller: Caller, succeeds: boolean) => Call | Promise<Call>;
  /** The call replaces the caller's session (sign-in, sign-out), so it runs in a session of its own. */
  ownSession?: boolean;
  /** Demo organization values the answer may hold for anyone: what an uploaded file itself says. */
  mayShow?: (f: Fixtures) => string[];
};

const presetBody = (name: string) => ({ name, kind: 'roads', fieldNames: ['RD_CLASS', 'NUM_LANES'], mapping: { roads: { roadClass: 'RD_CLASS', lanes: 'NUM_LANES', classValues: { '1': 'primary' } } } });
const viewerOnlySignedCopies = (expected: Expected): Expected => ({ ...expected, viewer: 403 });
const pick = async <T,>(succeeds: boolean, fresh: () => Promise<T>, shared: T) => (succeeds ? fresh() : shared);
const throughOwnPlan = 'the demo record through the caller’s own plan';
/** A name for what the caller creates; the demo organization's are remembered for the leak check. */
const named = (f: Fixtures, c: Caller, what: string) => {
  const name = `${what} ${f.next()}${isOtherOrganization(c) ? ' (Far County)' : ''}`;
  if (!isOtherOrganization(c)) f.remember(name);
  return name;
};

const rows: Row[] = [
  // Health checks, the session and sign-in answer everyone.
  { route: 'GET /healthz', expect: publicRoute(200) },
  { route: 'GET /readyz', expect: publicRoute(200) },
  { route: 'GET /api/auth/session', expect: publicRoute(200) },
  {
    route: 'POST /api/auth/sign-in',
    // A signed-out visitor signs in as Far County's viewer, so the leak check holds for them too.
    expect: publicRoute(200),
    ownSession: true,
    call: (_f, c) => ({ body: accountOf(c === 'signed out' ? 'other viewer' : c)! }),
  },
  { route: 'POST /api/auth/sign-out', expect: publicRoute(200), ownSession: true },
  {
    route: 'POST /api/auth/password',
    // Everyone signed in reaches the check of their current password; a wrong one changes nothing.
    variant: 'a wrong current password',
    expect: { ...publicRoute(400), 'signed out': 401 },
    call: () => ({ body: { currentPassword: 'not-the-password-1', newPassword: 'a-new-long-password-1' } }),
  },
  {
    route: 'POST /api/auth/organization',
    variant: 'into the demo organization',
    expect: { 'signed out': 401, admin: 200, planner: 200, official: 200, viewer: 200, 'other admin': 403, 'other planner': 403, 'other official': 403, 'other viewer': 403 },
    call: (f) => ({ body: { organizationId: f.organizationId } }),
  },

  // Plans
  { route: 'GET /api/plans', expect: readers(200, 'own') },
  { route: 'GET /api/plans', variant: 'a later page', expect: readers(200, 'own'), call: () => ({ query: 'limit=1&offset=1' }) },
  { route: 'POST /api/plans', expect: writers(201, 'own'), call: (f, c) => ({ body: { name: named(f, c, 'Ferry plan') } }) },
  { route: 'GET /api/plans/:id', expect: readers(200), call: (f) => ({ params: { id: f.plan.id } }) },
  { route: 'PATCH /api/plans/:id', expect: writers(200), call: (f) => ({ params: { id: f.drill.id }, body: { description: `Veltmoor drill copy, revision ${f.next()}` } }) },
  { route: 'DELETE /api/plans/:id', expect: writers(204), call: async (f, _c, ok) => ({ params: { id: await pick(ok, f.fresh.plan, f.keptPlanId) } }) },

  // Road layer and segments
  { route: 'GET /api/plans/:planId/road-layer', expect: readers(200), call: (f) => ({ params: { planId: f.plan.id } }) },
  // Imports (queued jobs: a worker reads and saves the file)
  {
    route: 'POST /api/plans/:planId/imports/:kind',
    expect: writers(202),
    // A file the reader refuses: the import is accepted (202) and fails in its job, writing no
    // shelter, so nothing lands in the tables later refused calls fingerprint.
    call: (f) => ({ params: { planId: f.drill.id, kind: 'shelters' }, file: { bytes: Buffer.from('not a feature collection'), name: 'refused.geojson' } }),
  },
  // Each kind the route imports, for each caller (files the reader refuses, as above).
  {
    route: 'POST /api/plans/:planId/imports/:kind',
    variant: 'a road file',
    expect: writers(202),
    call: (f) => ({ params: { planId: f.drill.id, kind: 'road-layer' }, file: { bytes: Buffer.from('{"type": "FeatureCollection", "features": ['), name: 'refused-roads.geojson' } }),
  },
  {
    route: 'POST /api/plans/:planId/imports/:kind',
    variant: 'a zone file',
    expect: writers(202),
    call: (f) => ({ params: { planId: f.drill.id, kind: 'zones' }, file: { bytes: Buffer.from('{"type": "FeatureCollection", "features": [{"type": "Feature"}]}'), name: 'refused-zones.geojson' } }),
  },
  { route: 'GET /api/plans/:planId/imports/:importId', expect: readers(200), call: (f) => ({ params: { planId: f.plan.id, importId: f.plan.queuedImportId } }) },
  {
    route: 'GET /api/plans/:planId/imports/:importId',
    variant: throughOwnPlan,
    expect: otherOrganizationOnly(readers(200)),
    call: (f) => ({ params: { planId: f.far.planId, importId: f.plan.queuedImportId } }),
  },
  {
    route: 'POST /api/plans/:planId/imports/:importId/cancel',
    expect: writers(200),
    call: async (f, _c, ok) => ({ params: { planId: f.plan.id, importId: await pick(ok, f.fresh.queuedImport, f.plan.queuedImportId) } }),
  },
  {
    route: 'POST /api/plans/:planId/imports/:importId/cancel',
    variant: throughOwnPlan,
    expect: otherOrganizationOnly(writers(200)),
    call: (f) => ({ params: { planId: f.far.planId, importId: f.plan.queuedImportId } }),
  },
  {
    route: 'POST /api/plans/:planId/file-schema',
    expect: writers(200),
    call: (f) => ({ params: { planId: f.drill.id }, file: { bytes: smallRoadFile(['Tannery Lane', 'Weir Street', 'Lock Bridge']), name: 'veltmoor-drill-roads.geojson' } }),
  },
  { route: 'GET /api/plans/:planId/segments', expect: readers(200), call: (f) => ({ params: { planId: f.plan.id } }) },
  { route: 'GET /api/plans/:planId/segments/:segmentId', expect: readers(200), call: (f) => ({ params: { planId: f.plan.id, segmentId: f.plan.segmentId } }) },
  {
    route: 'GET /api/plans/:planId/segments/:segmentId',
    variant: throughOwnPlan,
    expect: otherOrganizationOnly(readers(200)),
    call: (f) => ({ params: { planId: f.far.planId, segmentId: f.plan.segmentId } }),
  },
  {
    route: 'PATCH /api/plans/:planId/segments/:segmentId',
    expect: writers(200),
    call: (f) => ({ params: { planId: f.drill.id, segmentId: f.drill.segmentIds[0]! }, body: { speedKmh: 30 + (f.next() % 40) } }),
  },
  {
    route: 'PATCH /api/plans/:planId/segments/:segmentId',
    variant: throughOwnPlan,
    expect: otherOrganizationOnly(writers(200)),
    call: (f) => ({ params: { planId: f.far.planId, segmentId: f.drill.segmentIds[0]! }, body: { speedKmh: 30 + (f.next() % 40) } }),
  },
  { route: 'PATCH /api/plans/:planId/segments', expect: writers(200), call: (f) => ({ params: { planId: f.drill.id }, body: { ids: f.drill.segmentIds, patch: { speedKmh: 30 + (f.next() % 40) } } }) },
  {
    route: 'PATCH /api/plans/:planId/segments',
    variant: throughOwnPlan,
    expect: otherOrganizationOnly(writers(200)),
    call: (f) => ({ params: { planId: f.far.planId }, body: { ids: f.drill.segmentIds, patch: { speedKmh: 30 + (f.next() % 40) } } }),
  },

  // Zones and shelters
  { route: 'GET /api/plans/:planId/zones', expect: readers(200), call: (f) => ({ params: { planId: f.plan.id } }) },
  { route: 'POST /api/plans/:planId/zones', expect: writers(201), call: (f, c) => ({ params: { planId: f.drill.id }, body: zoneBody(named(f, c, 'Tannery Ward')) }) },
  { route: 'PATCH /api/plans/:planId/zones/:zoneId', expect: writers(200), call: (f) => ({ params: { planId: f.drill.id, zoneId: f.drill.zoneId }, body: { population: 1000 + f.next() } }) },
  {
    route: 'PATCH /api/plans/:planId/zones/:zoneId',
    variant: throughOwnPlan,
    expect: otherOrganizationOnly(writers(200)),
    call: (f) => ({ params: { planId: f.far.planId, zoneId: f.drill.zoneId }, body: { population: 1000 + f.next() } }),
  },
  { route: 'DELETE /api/plans/:planId/zones/:zoneId', expect: writers(204), call: async (f, _c, ok) => ({ params: { planId: f.drill.id, zoneId: await pick(ok, f.fresh.zone, f.drill.zoneId) } }) },
  { route: 'DELETE /api/plans/:planId/zones/:zoneId', variant: throughOwnPlan, expect: otherOrganizationOnly(writers(204)), call: (f) => ({ params: { planId: f.far.planId, zoneId: f.drill.zoneId } }) },
  { route: 'GET /api/plans/:planId/shelters', expect: readers(200), call: (f) => ({ params: { planId: f.plan.id } }) },
  { route: 'POST /api/plans/:planId/shelters', expect: writers(201), call: (f, c) => ({ params: { planId: f.drill.id }, body: shelterBody(named(f, c, 'Weir Hall')) }) },
  { route: 'PATCH /api/plans/:planId/shelters/:shelterId', expect: writers(200), call: (f) => ({ params: { planId: f.drill.id, shelterId: f.drill.shelterId }, body: { capacityPersons: 100 + f.next() } }) },
  {
    route: 'PATCH /api/plans/:planId/shelters/:shelterId',
    variant: throughOwnPlan,
    expect: otherOrganizationOnly(writers(200)),
    call: (f) => ({ params: { planId: f.far.planId, shelterId: f.drill.shelterId }, body: { capacityPersons: 100 + f.next() } }),
  },
  {
    route: 'DELETE /api/plans/:planId/shelters/:shelterId',
    expect: writers(204),
    call: async (f, _c, ok) => ({ params: { planId: f.drill.id, shelterId: await pick(ok, f.fresh.shelter, f.drill.shelterId) } }),
  },
  { route: 'DELETE /api/plans/:planId/shelters/:shelterId', variant: throughOwnPlan, expect: otherOrganizationOnly(writers(204)), call: (f) => ({ params: { planId: f.far.planId, shelterId: f.drill.shelterId } }) },
  { route: 'GET /api/plans/:planId/attachments', expect: readers(200), call: (f) => ({ params: { planId: f.plan.id } }) },
  { route: 'GET /api/plans/:planId/capacity-table', expect: readers(200), call: (f) => ({ params: { planId: f.plan.id } }) },
  { route: 'GET /api/plans/:planId/capacity-table/history', expect: readers(200), call: (f) => ({ params: { planId: f.plan.id } }) },
  {
    route: 'PUT /api/plans/:planId/capacity-table',
    expect: writers(200),
    call: (f) => ({ params: { planId: f.drill.id }, body: { ...defaultCapacityTable(), capacityFactor: 0.9, capacityFactorNote: `drill ${f.next()}` } }),
  },

  // Scenarios
  { route: 'GET /api/plans/:planId/scenarios', expect: readers(200), call: (f) => ({ params: { planId: f.plan.id } }) },
  { route: 'POST /api/plans/:planId/scenarios', expect: writers(201), call: (f, c) => ({ params: { planId: f.drill.id }, body: { name: named(f, c, 'Lock Bridge drill') } }) },
  { route: 'GET /api/plans/:planId/scenarios/:scenarioId', expect: readers(200), call: (f) => ({ params: { planId: f.plan.id, scenarioId: f.plan.scenarioId } }) },
  { route: 'GET /api/plans/:planId/scenarios/:scenarioId', variant: throughOwnPlan, expect: otherOrganizationOnly(readers(200)), call: (f) => ({ params: { planId: f.far.planId, scenarioId: f.plan.scenarioId } }) },
  {
    route: 'PATCH /api/plans/:planId/scenarios/:scenarioId',
    expect: writers(200),
    call: (f) => ({ params: { planId: f.drill.id, scenarioId: f.drill.scenarioId }, body: { description: `revision ${f.next()}` } }),
  },
  {
    route: 'PATCH /api/plans/:planId/scenarios/:scenarioId',
    variant: throughOwnPlan,
    expect: otherOrganizationOnly(writers(200)),
    call: (f) => ({ params: { planId: f.far.planId, scenarioId: f.drill.scenarioId }, body: { description: `revision ${f.next()}` } }),
  },
  {
    route: 'DELETE /api/plans/:planId/scenarios/:scenarioId',
    expect: writers(204),
    call: async (f, _c, ok) => ({ params: { planId: f.drill.id, scenarioId: await pick(ok, f.fresh.scenario, f.drill.scenarioId) } }),
  },
  {
    route: 'DELETE /api/plans/:planId/scenarios/:scenarioId',
    variant: throughOwnPlan,
    expect: otherOrganizationOnly(writers(204)),
    call: (f) => ({ params: { planId: f.far.planId, scenarioId: f.drill.scenarioId } }),
  },

  // Runs and sweeps
  { route: 'POST /api/plans/:planId/runs', expect: writers(202), call: (f) => ({ params: { planId: f.plan.id }, body: { parameters: f.parameters } }) },
  {
    route: 'POST /api/plans/:planId/runs',
    variant: 'under the demo scenario, in the caller’s own plan',
    expect: otherOrganizationOnly(writers(202)),
    call: (f) => ({ params: { planId: f.far.planId }, body: { parameters: f.parameters, scenarioId: f.plan.scenarioId } }),
  },
  { route: 'GET /api/plans/:planId/runs', expect: readers(200), call: (f) => ({ params: { planId: f.plan.id } }) },
  // Searches for the best change (proposals)
  { route: 'POST /api/plans/:planId/proposals', expect: writers(202), call: (f) => ({ params: { planId: f.plan.id }, body: { kind: 'zone-routes', parameters: f.parameters } }) },
  {
    route: 'POST /api/plans/:planId/proposals',
    variant: 'under the demo scenario, in the caller’s own plan',
    expect: otherOrganizationOnly(writers(202)),
    call: (f) => ({ params: { planId: f.far.planId }, body: { kind: 'zone-routes', parameters: f.parameters, scenarioId: f.plan.scenarioId } }),
  },
  { route: 'GET /api/plans/:planId/proposals', expect: readers(200), call: (f) => ({ params: { planId: f.plan.id } }) },
  { route: 'GET /api/plans/:planId/proposals/:proposalId', expect: readers(200), call: (f) => ({ params: { planId: f.plan.id, proposalId: f.plan.proposalId } }) },
  {
    route: 'GET /api/plans/:planId/proposals/:proposalId',
    variant: throughOwnPlan,
    expect: otherOrganizationOnly(readers(200)),
    call: (f) => ({ params: { planId: f.far.planId, proposalId: f.plan.proposalId } }),
  },
  {
    route: 'POST /api/plans/:planId/proposals/:proposalId/cancel',
    expect: writers(200),
    call: async (f, _c, ok) => ({ params: { planId: f.plan.id, proposalId: await pick(ok, f.fresh.queuedProposal, f.plan.queuedProposalId) } }),
  },
  {
    route: 'POST /api/plans/:planId/proposals/:proposalId/cancel',
    variant: throughOwnPlan,
    expect: otherOrganizationOnly(writers(200)),
    call: (f) => ({ params: { planId: f.far.planId, proposalId: f.plan.queuedProposalId } }),
  },
  {
    route: 'GET /api/plans/:planId/proposals/:proposalId/export/zone-routes.csv',
    expect: readers(200),
    call: (f) => ({ params: { planId: f.plan.id, proposalId: f.plan.zoneRoutesProposalId } }),
  },
  {
    route: 'GET /api/plans/:planId/proposals/:proposalId/export/zone-routes.csv',
    variant: throughOwnPlan,
    expect: otherOrganizationOnly(readers(200)),
    call: (f) => ({ params: { planId: f.far.planId, proposalId: f.plan.zoneRoutesProposalId } }),
  },
  {
    route: 'POST /api/plans/:planId/proposals/:proposalId/scenario',
    expect: writers(201),
    call: (f, c) => ({ params: { planId: f.plan.id, proposalId: f.plan.proposalId }, body: { name: named(f, c, 'Quickest order') } }),
  },
  {
    route: 'POST /api/plans/:planId/proposals/:proposalId/scenario',
    variant: throughOwnPlan,
    expect: otherOrganizationOnly(writers(201)),
    call: (f, c) => ({ params: { planId: f.far.planId, proposalId: f.plan.proposalId }, body: { name: named(f, c, 'Quickest order') } }),
  },

  { route: 'GET /api/plans/:planId/runs/:runId', expect: readers(200), call: (f) => ({ params: { planId: f.plan.id, runId: f.plan.runId } }) },
  { route: 'GET /api/plans/:planId/runs/:runId', variant: throughOwnPlan, expect: otherOrganizationOnly(readers(200)), call: (f) => ({ params: { planId: f.far.planId, runId: f.plan.runId } }) },
  {
    route: 'POST /api/plans/:planId/runs/:runId/cancel',
    expect: writers(200),
    call: async (f, _c, ok) => ({ params: { planId: f.plan.id, runId: await pick(ok, f.fresh.queuedRun, f.plan.queuedRunId) } }),
  },
  {
    route: 'POST /api/plans/:planId/runs/:runId/cancel',
    variant: throughOwnPlan,
    expect: otherOrganizationOnly(writers(200)),
    call: (f) => ({ params: { planId: f.far.planId, runId: f.plan.queuedRunId } }),
  },
  ...(['choke-points.csv', 'curve.csv', 'arcs.geojson', 'results.gpkg', 'results.kml'] as const).flatMap((file): Row[] => [
    { route: `GET /api/plans/:planId/runs/:runId/export/${file}`, expect: readers(200), call: (f) => ({ params: { planId: f.plan.id, runId: f.plan.runId } }) },
    {
      route: `GET /api/plans/:planId/runs/:runId/export/${file}`,
      variant: throughOwnPlan,
      expect: otherOrganizationOnly(readers(200)),
      call: (f) => ({ params: { planId: f.far.planId, runId: f.plan.runId } }),
    },
  ]),
  // The plan's inputs as files (server/routes/plan-exports.ts).
  ...(['plan-inputs.gpkg', 'plan-inputs.zip', 'roads.geojson', 'zones.geojson', 'shelters.geojson'] as const).map(
    (file): Row => ({ route: `GET /api/plans/:planId/export/${file}`, expect: readers(200), call: (f) => ({ params: { planId: f.plan.id } }) }),
  ),
  // The map's tiles and per-road reads (server/routes/map-tiles.ts).
  { route: 'GET /api/plans/:planId/tiles/roads/:z/:x/:y', expect: readers(200), call: (f) => ({ params: { planId: f.plan.id, z: 12, x: 2048, y: 2047 } }) },
  { route: 'GET /api/plans/:planId/runs/:runId/tiles/:z/:x/:y', expect: readers(200), call: (f) => ({ params: { planId: f.plan.id, runId: f.plan.runId, z: 12, x: 2048, y: 2047 } }) },
  {
    route: 'GET /api/plans/:planId/runs/:runId/tiles/:z/:x/:y',
    variant: throughOwnPlan,
    expect: otherOrganizationOnly(readers(200)),
    call: (f) => ({ params: { planId: f.far.planId, runId: f.plan.runId, z: 12, x: 2048, y: 2047 } }),
  },
  { route: 'GET /api/plans/:planId/runs/:runId/roads/:segmentId', expect: readers(200), call: (f) => ({ params: { planId: f.plan.id, runId: f.plan.runId, segmentId: f.plan.segmentId } }) },
  {
    route: 'GET /api/plans/:planId/runs/:runId/roads/:segmentId',
    variant: throughOwnPlan,
    expect: otherOrganizationOnly(readers(200)),
    call: (f) => ({ params: { planId: f.far.planId, runId: f.plan.runId, segmentId: f.plan.segmentId } }),
  },
  { route: 'GET /api/plans/:planId/runs/:runId/choke-point-geometry', expect: readers(200), call: (f) => ({ params: { planId: f.plan.id, runId: f.plan.runId } }) },
  {
    route: 'GET /api/plans/:planId/runs/:runId/choke-point-geometry',
    variant: throughOwnPlan,
    expect: otherOrganizationOnly(readers(200)),
    call: (f) => ({ params: { planId: f.far.planId, runId: f.plan.runId } }),
  },
  { route: 'GET /api/plans/:planId/segment-geometry', expect: readers(200), call: (f) => ({ params: { planId: f.plan.id }, query: `ids=${f.plan.segmentId}` }) },
  {
    route: 'POST /api/plans/:planId/sweeps',
    expect: writers(202),
    call: (f, c) => ({ params: { planId: f.plan.id }, body: { name: named(f, c, 'Veltmoor rain sweep'), parameters: f.parameters, sweep: { parameter: 'capacityFactor', values: [0.5, 1] } } }),
  },
  {
    route: 'POST /api/plans/:planId/sweeps',
    variant: 'under the demo scenario, in the caller’s own plan',
    expect: otherOrganizationOnly(writers(202)),
    call: (f) => ({ params: { planId: f.far.planId }, body: { name: 'Far sweep', scenarioId: f.plan.scenarioId, parameters: f.parameters, sweep: { parameter: 'capacityFactor', values: [0.5, 1] } } }),
  },
  { route: 'GET /api/plans/:planId/sweeps', expect: readers(200), call: (f) => ({ params: { planId: f.plan.id } }) },
  { route: 'GET /api/plans/:planId/sweeps/:sweepId', expect: readers(200), call: (f) => ({ params: { planId: f.plan.id, sweepId: f.plan.sweepId } }) },
  { route: 'GET /api/plans/:planId/sweeps/:sweepId', variant: throughOwnPlan, expect: otherOrganizationOnly(readers(200)), call: (f) => ({ params: { planId: f.far.planId, sweepId: f.plan.sweepId } }) },

  // Members, audit, settings
  { route: 'GET /api/members', expect: adminsOnly(200, 'own') },
  { route: 'GET /api/members', variant: 'a later page', expect: adminsOnly(200, 'own'), call: () => ({ query: 'limit=2&offset=2' }) },
  {
    route: 'POST /api/members',
    expect: adminsOnly(201, 'own'),
    call: (f, c) => {
      const email = `new-member-${f.next()}@${isOtherOrganization(c) ? 'far' : 'cutline'}.example`;
      if (!isOtherOrganization(c)) f.remember(email);
      return { body: { email, displayName: named(f, c, 'New member'), role: 'viewer', password: 'a-long-password-1' } };
    },
  },
  {
    route: 'POST /api/members',
    // Addresses are unique across the installation, so an administrator learns that this one
    // has an account somewhere; nothing else about it is answered.
    variant: 'an address that has an account in the demo organization',
    expect: adminsOnly(409, 'own'),
    call: () => ({ body: { email: 'viewer@cutline.example', displayName: 'Someone', role: 'viewer', password: 'a-long-password-1' } }),
  },
  { route: 'PATCH /api/members/:userId', expect: adminsOnly(200), call: async (f) => ({ params: { userId: await f.arrange.viewerAgain() }, body: { role: 'official' } }) },
  { route: 'POST /api/members/:userId/unlock', expect: adminsOnly(200), call: async (f) => ({ params: { userId: await f.arrange.locked() } }) },
  {
    route: 'POST /api/members/:userId/password',
    expect: adminsOnly(200),
    call: async (f, _c, ok) => ({ params: { userId: await pick(ok, f.fresh.member, f.members.roleChangeId) }, body: { password: 'a-new-long-password-1' } }),
  },
  { route: 'DELETE /api/members/:userId', expect: adminsOnly(204), call: async (f, _c, ok) => ({ params: { userId: await pick(ok, f.fresh.member, f.members.roleChangeId) } }) },
  { route: 'GET /api/audit', expect: adminsOnly(200, 'own') },
  { route: 'GET /api/audit', variant: 'before an id past every entry', expect: adminsOnly(200, 'own'), call: () => ({ query: 'before=999999999' }) },
  { route: 'GET /api/settings/map', expect: readers(200, 'own') },
  // Field-mapping presets: the organisation's own; readers list them, writers save and delete.
  { route: 'GET /api/mapping-presets', expect: readers(200, 'own') },
  { route: 'POST /api/mapping-presets', expect: writers(201, 'own'), call: (f, c) => ({ body: presetBody(named(f, c, 'County centrelines')) }) },
  {
    route: 'DELETE /api/mapping-presets/:presetId',
    expect: writers(204),
    call: async (f, _c, ok) => ({ params: { presetId: ok ? await demoPreset(named(f, 'planner', 'Spent preset')) : await demoPreset('Kept preset', f) } }),
  },
  // The map settings are the installation's, not an organization's: any organization's administrator sets them for all.
  { route: 'PUT /api/settings/map', expect: adminsOnly(200, 'own'), call: (f) => ({ body: { tileUrl: '', attribution: `Drill tiles ${f.next()}` } }) },
  { route: 'GET /api/settings/organization', expect: readers(200, 'own') },
  { route: 'PUT /api/settings/organization', expect: adminsOnly(200, 'own'), call: () => ({ body: { unitSystem: 'metric', timeZone: null } }) },

  // Briefings
  {
    route: 'POST /api/briefings/verify',
    // Anyone may check a copy they hold; a stranger is told only what the file itself says.
    expect: publicRoute(200),
    call: (f) => ({ file: { bytes: f.signedPdf, name: 'briefing.pdf' } }),
    mayShow: (f) => [f.briefings.signed, 'Mina Ashcombe', 'Veltmoor Emergency Management'],
  },
  { route: 'GET /api/briefings/officials', expect: writers(200, 'own') },
  { route: 'GET /api/briefings/outbox', expect: adminsOnly(200, 'own') },
  { route: 'GET /api/briefings/outbox/:messageId', expect: adminsOnly(200), call: (f) => ({ params: { messageId: f.outbox.messageId } }) },
  { route: 'GET /api/briefings/outbox/:messageId/attachments/:index', expect: adminsOnly(200), call: (f) => ({ params: { messageId: f.outbox.messageId, index: 0 } }) },
  { route: 'GET /api/briefings', expect: readers(200, 'own') },
  { route: 'GET /api/briefings', variant: 'of the demo plan', expect: readers(200, 'own'), call: (f) => ({ query: `planId=${f.plan.id}` }) },
  { route: 'POST /api/briefings', expect: writers(201), call: (f, c) => ({ body: { runId: f.plan.runId, title: named(f, c, 'Quay order briefing') } }) },
  { route: 'GET /api/briefings/:id', variant: 'signed', expect: readers(200), call: (f) => ({ params: { id: f.briefings.signed } }) },
  { route: 'GET /api/briefings/:id', variant: 'draft', expect: viewerOnlySignedCopies(readers(200)), call: (f) => ({ params: { id: f.briefings.draft } }) },
  { route: 'PATCH /api/briefings/:id', expect: writers(200), call: (f, c) => ({ params: { id: f.briefings.draft }, body: { title: named(f, c, 'Quay order briefing') } }) },
  { route: 'DELETE /api/briefings/:id', expect: writers(204), call: async (f, _c, ok) => ({ params: { id: await pick(ok, f.fresh.draft, f.briefings.draft) } }) },
  { route: 'GET /api/briefings/:id/pdf', variant: 'signed copy', expect: readers(200), call: (f) => ({ params: { id: f.briefings.signed } }) },
  { route: 'GET /api/briefings/:id/pdf', variant: 'draft', expect: viewerOnlySignedCopies(readers(200)), call: (f) => ({ params: { id: f.briefings.draft } }) },
  {
    route: 'GET /api/briefings/:id/pdf',
    variant: 'the draft of a signed briefing',
    expect: viewerOnlySignedCopies(readers(200)),
    call: (f) => ({ params: { id: f.briefings.signed }, query: 'file=draft' }),
  },
  { route: 'POST /api/briefings/:id/versions', expect: writers(201), call: (f) => ({ params: { id: f.briefings.signed }, body: {} }) },
  {
    route: 'POST /api/briefings/:id/sign-off-requests',
    // Each organization's planners name their own officials, as the form offers them.
    expect: writers(200),
    call: async (f, c, ok) => ({ params: { id: await pick(ok, f.fresh.draft, f.briefings.draft) }, body: { reviewerIds: [isOtherOrganization(c) ? f.far.officialId : f.members.officialId] } }),
  },
  { route: 'POST /api/briefings/:id/withdraw', expect: writers(200), call: async (f, _c, ok) => ({ params: { id: await pick(ok, f.fresh.awaitingSignOff, f.briefings.awaiting) } }) },
  { route: 'POST /api/briefings/:id/sign', expect: signers(200), call: async (f, _c, ok) => ({ params: { id: await pick(ok, f.fresh.awaitingSignOff, f.briefings.awaiting) } }) },
  {
    route: 'POST /api/briefings/:id/return',
    expect: signers(200),
    call: async (f, _c, ok) => ({ params: { id: await pick(ok, f.fresh.awaitingSignOff, f.briefings.awaiting) }, body: { comment: 'Use the winter capacity factor on Quay Bridge.' } }),
  },
  { route: 'POST /api/briefings/:id/distribute', expect: writers(200), call: async (f) => ({ params: { id: await f.arrange.undelivered() } }) },
];

/** A preset of the demo organisation, saved by its planner (the one named 'Kept preset' once). */
const keptPresets = new Map<string, string>();
async function demoPreset(name: string, f?: Fixtures): Promise<string> {
  const kept = keptPresets.get(name);
  if (kept) return kept;
  f?.remember(name);
  const planner = sessions.get('planner')!;
  const res = await planner.agent.post('/api/mapping-presets').set('x-csrf-token', planner.csrf).send(presetBody(name));
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  if (f) keptPresets.set(name, res.body.id);
  return res.body.id as string;
}

const titleOf = (r: Row) => (r.variant ? `${r.route} (${r.variant})` : r.route);

let ctx: TestContext;
let smtp: FakeSmtpServer;
let f: Fixtures;
const sessions = new Map<Caller, SignedInAgent>();

beforeAll(async () => {
  smtp = await startFakeSmtpServer({ onMessage: (m) => keepOutboxMessage(ctx.db, m) });
  ctx = await createTestContext({ SMTP_URL: smtp.url, PUBLIC_BASE_URL: 'http://cutline.test:8080', DEV_OUTBOX: 'on' }, { withRunWorker: true });
  const far = await seedOrganization(ctx.db, farCounty, farCountyAccounts, ctx.config.PASSWORD_HASH_ROUNDS);
  for (const c of callers) sessions.set(c, await sessionFor(ctx.app, c));
  const farPlanId = await createFarPlan(sessions.get('other planner')!);
  f = await createFixtures(ctx, (c) => sessions.get(c)!, { organizationId: far.organizationId, planId: farPlanId, officialId: far.userIds['official@far.example']! });
}, 180_000);
afterAll(async () => {
  expect(ctx?.errors).toEqual([]);
  await ctx?.drop();
  await smtp?.close();
});

describe('the table', () => {
  it('has a row for every route of the router, covering every caller', () => {
    const covered = new Set(rows.filter((r) => callers.every((c) => r.expect[c] !== undefined)).map((r) => r.route));
    expect(enumerateRoutes(ctx.app).map(routeKey).filter((k) => !covered.has(k))).toEqual([]);
  });
  it('names only routes the router has', () => {
    const routes = new Set(enumerateRoutes(ctx.app).map(routeKey));
    expect(rows.map((r) => r.route).filter((k) => !routes.has(k))).toEqual([]);
  });
  it('knows the demo organization’s ids, names and addresses the leak check looks for', () => {
    const expected = [f.organizationId, f.plan.id, f.plan.runId, f.plan.sweepId, f.plan.scenarioId, ...Object.values(f.briefings), f.members.officialId, 'Veltmoor river crossings', 'Riverside', 'Quay Bridge closed at dusk'];
    expect(expected.filter((t) => !f.tokens.has(t))).toEqual([]);
    expect([...f.tokens].filter((t) => t.endsWith('@cutline.example'))).toEqual(expect.arrayContaining(['admin@cutline.example', 'planner@cutline.example', 'official@cutline.example', 'viewer@cutline.example']));
  });
});

function url(route: string, call: Call): string {
  const path = route.split(' ')[1]!.replace(/:(\w+)/g, (_, name: string) => {
    const value = call.params?.[name];
    if (value === undefined) throw new Error(`${route}: no value for :${name}`);
    return encodeURIComponent(String(value));
  });
  return call.query ? `${path}?${call.query}` : path;
}

const uuids = /[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}/gi;

describe.each(rows.map((r) => [titleOf(r), r] as const))('%s', (_title, row) => {
  const cases = callers.filter((c) => row.expect[c] !== undefined).map((c) => [c, row.expect[c]!] as const);
  it.each(cases)('%s → %i', async (caller, status) => {
    const succeeds = status < 300;
    const call = (await row.call?.(f, caller, succeeds)) ?? {};
    const session = row.ownSession ? await sessionFor(ctx.app, caller) : sessions.get(caller)!;
    const method = row.route.split(' ')[0]!.toLowerCase() as 'get' | 'post' | 'patch' | 'put' | 'delete';
    // An upload answered earlier stores its last pieces, audit row and job behind its answer: that
    // is the earlier request's doing, so it is finished before this one is fingerprinted.
    await importUploadsSettled();
    const before = !succeeds && method !== 'get' ? await databaseFingerprint(ctx.pool) : null;

    let req = session.agent[method](url(row.route, call));
    if (method !== 'get') req = req.set('x-csrf-token', session.csrf);
    if (call.file) req = req.attach('file', call.file.bytes, call.file.name);
    else if (call.body) req = req.send(call.body);
    const res = await req.buffer(true).parse(binary);
    const bytes = res.body as Buffer;
    const json = /json/.test(res.headers['content-type'] ?? '');
    expect(res.status, bytes.toString('utf8').slice(0, 500)).toBe(status);

    if (!succeeds) {
      expect(JSON.parse(bytes.toString('utf8')).error, 'the error envelope').toBeDefined();
      if (before) expect(await databaseFingerprint(ctx.pool), 'a refused request changed the database').toEqual(before);
    }
    if (caller === 'signed out' || isOtherOrganization(caller)) {
      const allowed = new Set(row.mayShow?.(f) ?? []);
      const leaked = [...f.tokens].filter((t) => !allowed.has(t) && bytes.includes(t));
      expect(leaked, 'demo organization values in the answer').toEqual([]);
    } else if (succeeds && json) {
      // What the demo organization's own members are shown is theirs: later answers to Far County may not hold it.
      for (const id of bytes.toString('utf8').match(uuids) ?? []) f.remember(id);
    }
  });
});
