// Everything a run reads from a plan, loaded in one snapshot: the active road layer, the
// capacity table, zones and shelters, and where zones and shelters attach to the roads.
import { eq } from 'drizzle-orm';
import type { Database } from '../db/client';
import { plans } from '../db/schema';
import type { CapacityTable } from '../../shared/api/capacity-table';
import type { NetworkSegment } from '../../shared/api/road-attributes';
import type { ZoneAttachment, ShelterAttachment } from '../../shared/api/zone-shelter-attributes';
import type { Attachments, Shelter, Zone } from '../../shared/api/zones-shelters';
import type { Segment } from '../../shared/api/road-layers';
import { attachShelters, attachZones } from '../../shared/geo/attach-zones-and-shelters';
import { indexNodes, type NodeIndex } from '../../shared/geo/node-index';
import type { ShelterFeature } from '../../shared/geo/read-shelters';
import type { ZoneFeature } from '../../shared/geo/read-zones';
import { RoadImportError } from '../../shared/geo/road-import-error';
import { BadRequestError } from '../errors';
import { getCapacityTable } from './capacity-table';
import { activeLayerId, loadNetwork } from './road-layers';
import { zonesAndSheltersOfPlan } from './zones-shelters';
import { assertPlanInOrganization } from './plan-access';

export type PlanModel = {
  planId: string;
  dataVersion: number;
  layerId: number;
  nodes: { lon: number; lat: number }[];
  /** DB segments in id order; their position is the model's segment index. */
  segments: Segment[];
  capacityTable: CapacityTable;
  zones: Zone[];
  shelters: Shelter[];
};

export async function loadPlanModel(db: Database, organizationId: string, planId: string): Promise<PlanModel> {
  // One repeatable-read snapshot: an edit landing mid-load cannot mix two data versions.
  return db.transaction(
    async (tx) => {
      await assertPlanInOrganization(tx, organizationId, planId);
      const [plan] = await tx.select({ dataVersion: plans.dataVersion }).from(plans).where(eq(plans.id, planId));
      const layerId = await activeLayerId(tx, planId);
      if (layerId === null) throw new BadRequestError('This plan has no road layer yet: upload one first.');
      const { nodes, segments } = await loadNetwork(tx, layerId);
      const txDb = tx as unknown as Database;
      const capacityTable = await getCapacityTable(txDb, organizationId, planId);
      const { zones, shelters } = await zonesAndSheltersOfPlan(txDb, planId);
      return { planId, dataVersion: plan!.dataVersion, layerId, nodes, segments, capacityTable, zones, shelters };
    },
    { isolationLevel: 'repeatable read', accessMode: 'read only' },
  );
}

export function modelSegments(model: PlanModel): NetworkSegment[] {
  return model.segments.map((s) => ({
    fromNode: s.fromNode,
    toNode: s.toNode,
    coordinates: [],
    lengthMeters: s.lengthMeters,
    component: s.component,
    sourceFeatureIndex: 0,
    sourceId: s.sourceId,
    attributes: {
      roadClass: s.roadClass,
      lanesForward: s.lanesForward,
      lanesBackward: s.lanesBackward,
      oneway: s.oneway,
      speedKmh: s.speedKmh,
      name: s.name,
      bridge: s.bridge,
      tunnel: s.tunnel,
      layer: s.layer,
      closed: s.closed,
      capacityOverrideVehPerHourPerLane: s.capacityOverrideVehPerHourPerLane,
    },
  }));
}

export function zoneFeature(z: Zone, index: number): ZoneFeature {
  const { id, geometry, ...attributes } = z;
  return { index, id: String(id), attributes, geometry: geometry as ZoneFeature['geometry'], defaulted: [] };
}

export function shelterFeature(s: Shelter, index: number): ShelterFeature {
  return { index, id: String(s.id), attributes: { name: s.name, capacityPersons: s.capacityPersons }, coordinates: [s.lon, s.lat] };
}

export function nodeIndexOf(model: PlanModel): NodeIndex {
  return indexNodes({ nodes: model.nodes, segments: modelSegments(model) });
}

/** Attachments for the run: throws (400, every failing zone or shelter named) if any fails. */
export function attachAll(model: PlanModel, index = nodeIndexOf(model)): { zones: ZoneAttachment[]; shelters: ShelterAttachment[] } {
  const failures: string[] = [];
  let zones: ZoneAttachment[] = [];
  let shelters: ShelterAttachment[] = [];
  try {
    zones = attachZones(index, model.zones.map(zoneFeature));
  } catch (e) {
    if (!(e instanceof RoadImportError)) throw e;
    failures.push(...e.failure.badFeatures.map((b) => b.problem));
  }
  try {
    shelters = attachShelters(index, model.shelters.map(shelterFeature));
  } catch (e) {
    if (!(e instanceof RoadImportError)) throw e;
    failures.push(...e.failure.badFeatures.map((b) => b.problem));
  }
  if (failures.length > 0) throw new BadRequestError(`Cannot attach to the roads: ${failures.join('; ')}.`);
  return { zones, shelters };
}

/** Per zone and shelter, for the workspace: where each attaches, or why it cannot. */
export function describeAttachments(model: PlanModel): Attachments {
  const index = nodeIndexOf(model);
  const node = (i: number) => ({ index: i, lon: model.nodes[i]!.lon, lat: model.nodes[i]!.lat });
  return {
    zones: model.zones.map((z, i): Attachments['zones'][number] => {
      try {
        const [a] = attachZones(index, [zoneFeature(z, i)]);
        return { zoneId: z.id, attachedBy: a!.attachedBy, distanceMeters: a!.distanceMeters, nodes: a!.entryNodes.map(node), problem: null };
      } catch (e) {
        if (!(e instanceof RoadImportError)) throw e;
        return { zoneId: z.id, attachedBy: 'nearest', distanceMeters: 0, nodes: [], problem: e.failure.badFeatures[0]?.problem ?? e.message };
      }
    }),
    shelters: model.shelters.map((s, i) => {
      try {
        const [a] = attachShelters(index, [shelterFeature(s, i)]);
        return { shelterId: s.id, distanceMeters: a!.distanceMeters, node: node(a!.node), problem: null };
      } catch (e) {
        if (!(e instanceof RoadImportError)) throw e;
        return { shelterId: s.id, distanceMeters: 0, node: null, problem: e.failure.badFeatures[0]?.problem ?? e.message };
      }
    }),
  };
}
