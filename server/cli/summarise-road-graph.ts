// The CLI's one-object summary of a built network: counts, what was kept and dropped, what
// the class defaults filled in (with the values and their sources), and topology problems.
import type { CapacityTable } from '../../shared/api/capacity-table';
import type { RoadGraph } from '../../shared/geo/build-road-graph';
import { capacityRowFor } from '../../shared/model';

const round = (x: number, digits = 1) => Math.round(x * 10 ** digits) / 10 ** digits;

export function summariseNetwork(network: RoadGraph, table: CapacityTable) {
  const r = network.report;
  return {
    format: r.sourceFormat,
    features: r.featureCount,
    nodes: r.nodeCount,
    arcs: r.arcCount,
    segments: r.segmentCount,
    lengthKm: round(r.totalLengthMeters / 1000, 3),
    kept: r.kept.map((k) => ({ ...k, lengthMeters: round(k.lengthMeters) })),
    dropped: r.dropped,
    defaultsApplied: r.defaultsApplied.map((d) => {
      const row = capacityRowFor(table, d.roadClass);
      return {
        ...d,
        lanesPerDirection: row.lanesPerDirection,
        speedKmh: row.speedKmh,
        capacityVehPerHourPerLane: row.capacityVehPerHourPerLane,
        capacitySource: row.capacitySource,
      };
    }),
    unreadValues: r.unreadValues,
    waysCutAtMissingNodes: r.waysCutAtMissingNodes.length,
    splitAtCrossings: r.splitAtCrossings,
    crossingsJoined: r.crossingsJoined,
    crossingsOnDifferentLayers: r.crossingsOnDifferentLayers,
    snappedEnds: r.snappedEnds.reduce((sum, s) => sum + s.ends, 0),
    snappedAtNodes: r.snappedEnds.length,
    danglingEnds: r.danglingEnds.length,
    tinySegments: { belowMeters: r.tinySegmentMeters, count: r.tinySegments.length },
    components: {
      count: r.components.length,
      largestShareOfLength: round(r.components[0]?.shareOfLength ?? 0, 4),
      largest: r.components.slice(0, 5).map((c) => ({ id: c.id, nodes: c.nodes, segments: c.segments, lengthMeters: round(c.lengthMeters) })),
    },
  };
}
