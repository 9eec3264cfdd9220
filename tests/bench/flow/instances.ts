// The bench instances: invented road-like cities (road-like-city.ts) as static networks and as
// a time-expanded network of about five million arcs.
import {
  buildSteadyStateNetwork,
  expandOverTime,
  type EvacuationProblem,
  type FlowNetwork,
} from '../../../shared/flow';
import { genrmf, randomLevelGraph, type FamilyNetwork } from './families';
import { generateCity, type CitySpec } from './road-like-city';

export interface BenchInstance {
  name: string;
  kind: 'static' | 'time-expanded' | 'family';
  description: string;
  spec: CitySpec;
  /** For the 'family' kind: the s–t network itself (no evacuation problem behind it). */
  family?: () => FamilyNetwork;
}

/** The bench's city spec: `width` × `width` intersections, the rest as below unless overridden. */
export const city = (width: number, spec: Partial<CitySpec> = {}): CitySpec => ({
  width,
  height: width,
  seed: 7,
  blockMeters: 120,
  arterialEvery: 8,
  bridges: 5,
  zoneBlocks: 10,
  zoneShare: 0.3,
  vehiclesPerNode: 4,
  shelters: 12,
  timeStepSeconds: 30,
  horizonSteps: 60,
  ...spec,
});

export const INSTANCES: BenchInstance[] = [
  { name: 'static-10k', kind: 'static', description: 'city of 100 × 100 intersections, static (veh/h)', spec: city(100) },
  { name: 'static-62k', kind: 'static', description: 'city of 250 × 250 intersections, static (veh/h)', spec: city(250) },
  { name: 'static-250k', kind: 'static', description: 'city of 500 × 500 intersections, static (veh/h)', spec: city(500) },
  {
    name: 'expanded-5m',
    kind: 'time-expanded',
    description: 'city of 80 × 80 intersections (250 m blocks), Δ = 30 s, T = 165 steps',
    spec: city(80, { blockMeters: 250, vehiclesPerNode: 12, horizonSteps: 165 }),
  },
  { name: 'genrmf-long', kind: 'family', description: 'GENRMF-like, 48 frames of 12 × 12', spec: city(2), family: () => genrmf(12, 48, 11) },
  { name: 'genrmf-wide', kind: 'family', description: 'GENRMF-like, 10 frames of 32 × 32', spec: city(2), family: () => genrmf(32, 10, 12) },
  { name: 'rlg-long', kind: 'family', description: 'random level graph, 512 levels of 64 nodes', spec: city(2), family: () => randomLevelGraph(64, 512, 13) },
  { name: 'rlg-wide', kind: 'family', description: 'random level graph, 32 levels of 512 nodes', spec: city(2), family: () => randomLevelGraph(512, 32, 14) },
];

export function findInstance(name: string): BenchInstance {
  const instance = INSTANCES.find((i) => i.name === name);
  if (!instance) throw new Error(`unknown instance ${name}; known: ${INSTANCES.map((i) => i.name).join(', ')}`);
  return instance;
}

export function problemOf(instance: BenchInstance): EvacuationProblem {
  return generateCity(instance.spec);
}

/** The s–t network the max-flow rows of the table solve. */
export function networkOf(instance: BenchInstance, problem: EvacuationProblem): { network: FlowNetwork; source: number; sink: number } {
  if (instance.family) return instance.family();
  if (instance.kind === 'static') {
    const steady = buildSteadyStateNetwork(problem);
    return { network: steady.network, source: steady.source, sink: steady.sink };
  }
  const expanded = expandOverTime(problem);
  return { network: expanded.network, source: expanded.source, sink: expanded.sink };
}
