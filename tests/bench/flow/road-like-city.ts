// Invented road-like test cities for the bench: a grid of streets with arterials every few
// blocks, a ring road joined to the arterials by ramps, a river crossed only by a few bridges,
// evacuation zones on the west side and shelters beyond the river on the east side.
// Capacities follow docs/model.md §3 (residential 600 veh/h/lane, primary 2 × 1,000, motorway
// 2 × 2,000, motorway_link 1,500); the town and its numbers are made up.

import type { EvacuationProblem, EvacuationRoad, EvacuationZone, EvacuationShelter } from '../../../shared/flow';
import { seededRandom } from './seeded-random';

export interface CitySpec {
  /** Intersections per row and per column. */
  width: number;
  height: number;
  seed: number;
  blockMeters: number;
  /** Every arterialEvery-th street is an arterial. */
  arterialEvery: number;
  bridges: number;
  /** Zone side in blocks; zones tile the western zoneShare of the city. */
  zoneBlocks: number;
  zoneShare: number;
  vehiclesPerNode: number;
  shelters: number;
  timeStepSeconds: number;
  horizonSteps: number;
}

const KMH = 1000 / 3600;

export function generateCity(spec: CitySpec): EvacuationProblem {
  const random = seededRandom(spec.seed);
  const { width: W, height: H, blockMeters } = spec;
  const roads: EvacuationRoad[] = [];
  const riverX = Math.floor(W * 0.62);
  const bridgeRows = new Set<number>();
  for (let b = 0; b < spec.bridges; b++) bridgeRows.add(Math.floor(((b + 0.5) * H) / spec.bridges));
  const node = (x: number, y: number): number => y * W + x;
  const isArterial = (line: number): boolean => line % spec.arterialEvery === 0;

  const twoWay = (a: number, b: number, lanes: number, perLane: number, kmh: number, meters: number): void => {
    const factor = 0.85 + 0.15 * random();
    for (const [from, to] of [[a, b], [b, a]] as const) {
      roads.push({
        from,
        to,
        lanes,
        capacityVehPerHourPerLane: perLane,
        capacityVehPerHour: Math.round(lanes * perLane * factor),
        travelTimeSeconds: meters / (kmh * KMH),
        storageVehicles: Math.round((lanes * meters * 118.06) / 1000),
      });
    }
  };

  for (let y = 0; y < H; y++) {
    for (let x = 0; x < W; x++) {
      if (x + 1 < W) {
        const crossesRiver = x === riverX;
        if (!crossesRiver || bridgeRows.has(y)) {
          if (crossesRiver) twoWay(node(x, y), node(x + 1, y), 2, 1000, 50, blockMeters * 1.5);
          else if (isArterial(y)) twoWay(node(x, y), node(x + 1, y), 2, 1000, 60, blockMeters);
          else if (random() > 0.04) twoWay(node(x, y), node(x + 1, y), 1, 600, 40, blockMeters);
        }
      }
      if (y + 1 < H) {
        if (isArterial(x)) twoWay(node(x, y), node(x, y + 1), 2, 1000, 60, blockMeters);
        else if (random() > 0.04) twoWay(node(x, y), node(x, y + 1), 1, 600, 40, blockMeters);
      }
    }
  }

  // The ring road: its own nodes, joined by ramps to the grid where arterials meet it.
  let nodeCount = W * H;
  const ringFirst = nodeCount;
  const radius = 0.38 * Math.min(W, H);
  const cx = W / 2;
  const cy = H / 2;
  const ringNodes = Math.max(8, Math.round((2 * Math.PI * radius) / spec.arterialEvery));
  for (let k = 0; k < ringNodes; k++) {
    const angle = (2 * Math.PI * k) / ringNodes;
    const gx = Math.round(cx + radius * Math.cos(angle));
    const gy = Math.round(cy + radius * Math.sin(angle));
    const ringNode = ringFirst + k;
    const next = ringFirst + ((k + 1) % ringNodes);
    const segmentMeters = ((2 * Math.PI * radius) / ringNodes) * blockMeters;
    twoWay(ringNode, next, 2, 2000, 100, segmentMeters);
    twoWay(ringNode, node(Math.min(W - 1, Math.max(0, gx)), Math.min(H - 1, Math.max(0, gy))), 1, 1500, 60, 300);
  }
  nodeCount += ringNodes;

  const zones: EvacuationZone[] = [];
  const zoneColumns = Math.floor((W * spec.zoneShare) / spec.zoneBlocks);
  const zoneRows = Math.floor(H / spec.zoneBlocks);
  for (let zy = 0; zy < zoneRows; zy++) {
    for (let zx = 0; zx < zoneColumns; zx++) {
      const entryNodes: number[] = [];
      for (let k = 0; k < 4; k++) {
        entryNodes.push(node(zx * spec.zoneBlocks + Math.floor(random() * spec.zoneBlocks), zy * spec.zoneBlocks + Math.floor(random() * spec.zoneBlocks)));
      }
      const vehicles = Math.round(spec.vehiclesPerNode * spec.zoneBlocks * spec.zoneBlocks * (0.6 + 0.8 * random()));
      zones.push({ id: `zone-${zy}-${zx}`, entryNodes, vehicles, releaseFractionByStep: logisticRelease(spec) });
    }
  }
  const shelters: EvacuationShelter[] = [];
  for (let s = 0; s < spec.shelters; s++) {
    const x = W - 1 - Math.floor(random() * Math.max(1, W - riverX - 2));
    const y = Math.floor(random() * H);
    shelters.push({ id: `shelter-${s}`, node: node(x, y), capacityVehicles: s % 3 === 0 ? null : Math.round(2000 + 3000 * random()) });
  }
  return { nodeCount, roads, zones, shelters, timeStepSeconds: spec.timeStepSeconds, horizonSteps: spec.horizonSteps };
}

/** Logistic departure curve with half the vehicles gone at a third of the horizon (docs/model.md §4 form). */
function logisticRelease(spec: CitySpec): number[] {
  const T = spec.horizonSteps;
  const half = T / 3;
  const rate = 8 / T;
  const shares: number[] = [];
  const atZero = 1 / (1 + Math.exp(rate * half));
  for (let step = 0; step <= T; step++) {
    const p = 1 / (1 + Math.exp(-rate * (step + 1 - half)));
    shares.push(Math.min(1, Math.max(0, (p - atZero) / (1 - atZero))));
  }
  return shares;
}
