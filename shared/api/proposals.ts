// Proposals: the product searches for the best change instead of evaluating one the planner
// thought of. Each proposal is a background job of its own kind (queued, progress, cancellable,
// stored with its exact input), and its answer can be saved as a scenario, run and compared.
import { z } from 'zod';
import { roadClassSchema } from './road-attributes';
import { runParametersSchema, runStatusSchema } from './runs';
import { scenarioOverlaySchema } from './scenarios';

export const proposalKindSchema = z.enum(['contraflow', 'closures', 'lanes', 'release-order', 'zone-routes']);
export type ProposalKind = z.infer<typeof proposalKindSchema>;

export const proposalKindTitles: Record<ProposalKind, string> = {
  contraflow: 'Roads to run one way, outbound',
  closures: 'Closures that would hurt most',
  lanes: 'Where added lanes help most',
  'release-order': 'Quickest departure order',
  'zone-routes': 'Where each zone goes',
};

/** Said with every proposal, beside the product's planning-aid caution. */
export const proposalCaution =
  'A mathematical optimum under the stated assumptions is not an operational plan: contraflow needs crossovers at both ends, staff and traffic control, and a licensed engineer’s design; closures, added lanes and departure orders need the same review.';

const lngLat = z.tuple([z.number().min(-180).max(180), z.number().min(-90).max(90)]);
/** A drawn area: one ring of at least three corners (closed or not), longitude first. */
export const proposalAreaSchema = z.array(lngLat).min(3).max(500);

const common = {
  parameters: runParametersSchema,
  scenarioId: z.string().uuid('Not a valid identifier.').nullable().default(null),
};

export const proposalRequestSchema = z.discriminatedUnion('kind', [
  z.object({
    kind: z.literal('contraflow'),
    ...common,
    roadClasses: z.array(roadClassSchema).max(20).default([]),
    area: proposalAreaSchema.nullable().default(null),
    maxCorridors: z.number().int().min(1).max(50).nullable().default(null),
  }),
  z.object({
    kind: z.literal('closures'),
    ...common,
    closeAtMinutes: z.number().min(0).max(72 * 60).default(0),
    // A chosen set (bridges, ramps); empty = the roads that carry flow in the plan.
    segmentIds: z.array(z.number().int().positive()).max(2000).default([]),
    roadClasses: z.array(roadClassSchema).max(20).default([]),
    maxRoads: z.number().int().min(1).max(500).default(200),
  }),
  z.object({
    kind: z.literal('lanes'),
    ...common,
    budgetLanes: z.number().int().min(1).max(50),
    maxLanesPerRoad: z.number().int().min(1).max(4).default(1),
    roadClasses: z.array(roadClassSchema).max(20).default([]),
  }),
  z.object({ kind: z.literal('release-order'), ...common }),
  z.object({ kind: z.literal('zone-routes'), ...common }),
]);
export type ProposalRequest = z.input<typeof proposalRequestSchema>;
export type ParsedProposalRequest = z.output<typeof proposalRequestSchema>;

const segmentRef = z.object({
  segmentId: z.number().int(),
  direction: z.enum(['forward', 'backward']),
  name: z.string(),
  roadClass: z.string(),
});
export type ProposalSegmentRef = z.infer<typeof segmentRef>;
const minutes = z.number().nullable();

export const contraflowAnswerSchema = z.object({
  kind: z.literal('contraflow'),
  baseVehiclesPerHour: z.number(),
  boundVehiclesPerHour: z.number(),
  achievedVehiclesPerHour: z.number(),
  method: z.enum(['exact', 'greedy-with-bound']),
  corridorsNeeded: z.number(),
  candidatePairs: z.number(),
  // Each corridor: the segments whose both carriageways run in `direction` (of the segment).
  corridors: z.array(z.object({ segments: z.array(segmentRef), gainVehiclesPerHour: z.number() })),
  timeExpanded: z
    .object({
      baseClearanceMinutes: minutes,
      boundClearanceMinutes: minutes,
      chosenClearanceMinutes: minutes,
      chosenFrom: z.enum(['steady-state', 'time-expanded']),
      gapMinutes: minutes,
      gapVehicles: z.number(),
      segments: z.array(segmentRef),
    })
    .nullable(),
});

export const closuresAnswerSchema = z.object({
  kind: z.literal('closures'),
  closeAtMinutes: z.number(),
  baseVehiclesPerHour: z.number(),
  baseClearanceMinutes: minutes,
  truncated: z.boolean(),
  roads: z.array(
    segmentRef.extend({
      baseFlowVehiclesPerHour: z.number(),
      lossVehiclesPerHour: z.number(),
      clearanceMinutes: minutes,
      clearanceLossMinutes: minutes,
      deliveredLossVehicles: z.number(),
      stopsClearance: z.boolean(),
      // False: only the loss in vehicles per hour was computed for this road (the clearance is tested for the worst 20).
      clearanceTested: z.boolean(),
    }),
  ),
});

export const lanesAnswerSchema = z.object({
  kind: z.literal('lanes'),
  baseVehiclesPerHour: z.number(),
  achievedVehiclesPerHour: z.number(),
  boundVehiclesPerHour: z.number().nullable(),
  method: z.enum(['mip', 'greedy']),
  exact: z.boolean(),
  budgetLanes: z.number(),
  spentLanes: z.number(),
  note: z.string(),
  picks: z.array(segmentRef.extend({ lanes: z.number(), addedVehiclesPerHour: z.number() })),
  steps: z.array(segmentRef.extend({ throughputVehiclesPerHour: z.number(), gainVehiclesPerHour: z.number() })),
});

export const releaseOrderAnswerSchema = z.object({
  kind: z.literal('release-order'),
  stepMinutes: z.number(),
  quickestClearanceMinutes: minutes,
  expectedClearanceMinutes: minutes,
  scheduleClearanceMinutes: minutes,
  waitsMovedHome: z.boolean(),
  demandVehicles: z.number(),
  quickestDeliveredByStep: z.array(z.number()),
  expectedDeliveredByStep: z.array(z.number()),
  zones: z.array(
    z.object({
      zoneId: z.number().int(),
      name: z.string(),
      vehicles: z.number(),
      firstDepartureMinutes: minutes,
      lastDepartureMinutes: minutes,
      departuresByStep: z.array(z.number()),
    }),
  ),
});

export const zoneRoutesAnswerSchema = z.object({
  kind: z.literal('zone-routes'),
  clearanceMinutes: minutes,
  zones: z.array(
    z.object({
      zoneId: z.number().int(),
      name: z.string(),
      vehicles: z.number(),
      deliveredVehicles: z.number(),
      shelters: z.array(z.object({ shelterId: z.number().int(), name: z.string(), vehicles: z.number() })),
      mainRoads: z.array(segmentRef.extend({ vehicles: z.number() })),
      roads: z.array(segmentRef.extend({ vehicles: z.number() })),
      departureWindowMinutes: z.tuple([z.number(), z.number()]).nullable(),
      arrivalWindowMinutes: z.tuple([z.number(), z.number()]).nullable(),
    }),
  ),
});

export const proposalAnswerSchema = z.discriminatedUnion('kind', [
  contraflowAnswerSchema,
  closuresAnswerSchema,
  lanesAnswerSchema,
  releaseOrderAnswerSchema,
  zoneRoutesAnswerSchema,
]);
export type ProposalAnswer = z.infer<typeof proposalAnswerSchema>;

/** Where the search stopped at a limit (shared/format/search-limits.ts words it): what, and what to do. */
export const searchLimitSchema = z.object({
  kind: z.enum(['horizon', 'candidates', 'clearance-tests', 'size']),
  message: z.string(),
});
export type SearchLimit = z.infer<typeof searchLimitSchema>;

export const proposalResultSchema = z.object({
  answer: proposalAnswerSchema,
  // Answers stored before limits were recorded read as none.
  limits: z.array(searchLimitSchema).default([]),
  // Which layout of the time-expanded network the search solved on: written out ('explicit'), or
  // implicit where that would not fit the run budget; null for searches that do not look over
  // time (and for answers stored before this was recorded).
  expandedLayout: z.enum(['explicit', 'implicit']).nullable().optional(),
  // The change as a scenario overlay, ready to save (null when the answer is no change).
  overlay: scenarioOverlaySchema.nullable(),
  caution: z.string(),
  engineVersion: z.string(),
  solveMs: z.number(),
});
export type ProposalResult = z.infer<typeof proposalResultSchema>;

export const proposalSchema = z.object({
  id: z.string().uuid(),
  planId: z.string().uuid(),
  scenarioId: z.string().uuid().nullable(),
  kind: proposalKindSchema,
  request: z.record(z.string(), z.unknown()),
  status: runStatusSchema,
  phase: z.string(),
  progress: z.number(),
  failureReason: z.string().nullable(),
  savedScenarioId: z.string().uuid().nullable(),
  createdAt: z.string(),
  finishedAt: z.string().nullable(),
  result: proposalResultSchema.nullable(),
});
export type Proposal = z.infer<typeof proposalSchema>;
export const proposalListSchema = z.array(proposalSchema);

export const proposalParamsSchema = z.object({ planId: z.string().uuid(), proposalId: z.string().uuid('Not a valid identifier.') });
export const saveProposalSchema = z.object({
  name: z.string().trim().min(1, 'Give the scenario a name.').max(120),
  // For closures: which ranked road to close (the proposal itself is a ranking, not one change).
  segmentId: z.number().int().positive().optional(),
});
