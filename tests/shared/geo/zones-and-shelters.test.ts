// Zones attach at the nodes inside them (else the nearest), shelters at the nearest node,
// with an error naming each one that is too far; uploads are validated feature by feature.
import { describe, expect, it } from 'vitest';
import type { ImportFailure } from '../../../shared/api/road-import';
import { attachShelters, attachZones, buildRoadGraph, indexNodes, readShelters, readZones, RoadImportError } from '../../../shared/geo';
import { ZONE_DEFAULTS } from '../../../shared/model';

// Local metres around lon 0, lat 0 (1 m ≈ 8.98e-6°).
const D = 1 / 111195;
const pt = (x: number, y: number) => [x * D, y * D];
const line = (tags: Record<string, string>, ...p: [number, number][]) => ({ type: 'Feature', properties: tags, geometry: { type: 'LineString', coordinates: p.map(([x, y]) => pt(x, y)) } });
// A residential street along y = 0 (nodes at x = 0, 100, 200) and a motorway along y = 50
// that touches nothing else.
const network = buildRoadGraph({
  type: 'FeatureCollection',
  features: [
    line({ highway: 'residential' }, [0, 0], [100, 0]),
    line({ highway: 'residential' }, [100, 0], [200, 0]),
    line({ highway: 'motorway', oneway: 'no' }, [0, 50], [200, 50]),
  ],
});
const index = indexNodes(network);
const nodeAt = (x: number, y: number) => network.nodes.findIndex((n) => Math.abs(n.lon - x * D) < 1e-9 && Math.abs(n.lat - y * D) < 1e-9);
const square = (x0: number, y0: number, x1: number, y1: number) => [[pt(x0, y0), pt(x1, y0), pt(x1, y1), pt(x0, y1), pt(x0, y0)]];
const zoneFeature = (properties: Record<string, unknown>, coordinates: unknown = square(-10, -10, 150, 60)) => ({ type: 'Feature', properties, geometry: { type: 'Polygon', coordinates } });
const collection = (...features: unknown[]) => ({ type: 'FeatureCollection', features });

function failure(run: () => unknown): ImportFailure {
  try {
    run();
  } catch (error) {
    expect(error).toBeInstanceOf(RoadImportError);
    return (error as RoadImportError).failure;
  }
  throw new Error('expected a failure');
}

describe('reading zones', () => {
  it('reads attributes, with the departure curve as an object, as JSON text or as flat fields', () => {
    const zones = readZones(
      collection(
        zoneFeature({ name: 'A', population: 1000, participationRate: 0.9, personsPerVehicle: 2.5, departureCurve: { kind: 'uniform', durationHours: 3 } }),
        zoneFeature({ name: 'B', population: '250', participationRate: '0.5', personsPerVehicle: 2, departureCurve: '{"kind":"rayleigh","sigmaHours":1.5}' }),
        zoneFeature({ name: 'C', population: 10, participationRate: 1, personsPerVehicle: 1, departure: 'logistic', responseRatePerHour: '2', halfLoadingHours: 1 }),
      ),
    );
    expect(zones.map((z) => z.attributes)).toEqual([
      { name: 'A', population: 1000, participationRate: 0.9, personsPerVehicle: 2.5, departureCurve: { kind: 'uniform', durationHours: 3 } },
      { name: 'B', population: 250, participationRate: 0.5, personsPerVehicle: 2, departureCurve: { kind: 'rayleigh', sigmaHours: 1.5 } },
      { name: 'C', population: 10, participationRate: 1, personsPerVehicle: 1, departureCurve: { kind: 'logistic', responseRatePerHour: 2, halfLoadingHours: 1 } },
    ]);
    expect(zones.every((z) => z.defaulted.length === 0)).toBe(true);
  });

  it('fills missing participation, persons per vehicle and curve from the stated defaults, and says so', () => {
    const [z] = readZones(collection(zoneFeature({ name: 'D', population: 40 })));
    expect(z!.attributes).toMatchObject({
      participationRate: ZONE_DEFAULTS.participationRate,
      personsPerVehicle: ZONE_DEFAULTS.personsPerVehicle,
      departureCurve: ZONE_DEFAULTS.departureCurve,
    });
    expect(z!.defaulted).toEqual(['participationRate', 'personsPerVehicle', 'departureCurve']);
  });

  it('lists every bad zone: no population, a percentage for a rate, a point, an open ring', () => {
    const f = failure(() =>
      readZones(
        collection(
          zoneFeature({ name: 'ok', population: 5 }),
          zoneFeature({ name: 'no people' }),
          zoneFeature({ name: 'percent', population: 5, participationRate: 80 }),
          { type: 'Feature', properties: { name: 'dot', population: 5 }, geometry: { type: 'Point', coordinates: [0, 0] } },
          zoneFeature({ name: 'open', population: 5 }, [[pt(0, 0), pt(10, 0), pt(10, 10), pt(0, 10)]]),
        ),
      ),
    );
    expect(f.code).toBe('badFeatures');
    expect(f.badFeatures.map((b) => b.index)).toEqual([1, 2, 3, 4]);
    expect(f.badFeatures[0]!.problem).toMatch(/population/);
    expect(f.badFeatures[1]!.problem).toMatch(/participationRate/);
    expect(f.badFeatures[2]!.problem).toMatch(/Polygon or MultiPolygon/);
    expect(f.badFeatures[3]!.problem).toMatch(/not closed|four positions/);
  });
});

describe('attaching zones', () => {
  it('uses the nodes inside the zone, leaving out motorway-only nodes', () => {
    const [zone] = readZones(collection(zoneFeature({ name: 'Z', population: 100 })));
    const [a] = attachZones(index, [zone!]);
    expect(a).toEqual({ zoneIndex: 0, entryNodes: [nodeAt(0, 0), nodeAt(100, 0)].sort((p, q) => p - q), attachedBy: 'inside', distanceMeters: 0 });
    expect(a!.entryNodes).not.toContain(nodeAt(0, 50));
  });

  it('attaches a zone with no node inside to the nearest node, with its distance', () => {
    const [zone] = readZones(collection(zoneFeature({ name: 'Z', population: 100 }, square(210, -20, 300, 20))));
    const [a] = attachZones(index, [zone!]);
    expect(a).toMatchObject({ entryNodes: [nodeAt(200, 0)], attachedBy: 'nearest' });
    expect(a!.distanceMeters).toBeCloseTo(10, 0);
  });

  it('fails, naming each zone, when nothing is within the limit', () => {
    const zones = readZones(collection(zoneFeature({ name: 'Far', population: 1 }, square(5000, 5000, 5100, 5100)), zoneFeature({ name: 'Near', population: 1 })));
    const f = failure(() => attachZones(index, zones, { zoneMaxDistanceMeters: 500 }));
    expect(f.code).toBe('attachmentFailed');
    expect(f.badFeatures).toEqual([{ index: 0, id: null, problem: 'zone "Far" has no road node inside it or within 500 m' }]);
  });
});

describe('shelters and exits', () => {
  const point = (properties: Record<string, unknown>, x: number, y: number) => ({ type: 'Feature', properties, geometry: { type: 'Point', coordinates: pt(x, y) } });

  it('reads capacities; empty or "unbounded" is an exit; bad values are listed', () => {
    const shelters = readShelters(collection(point({ name: 'Hall', capacityPersons: 300 }, 0, 0), point({ name: 'Edge', capacityPersons: 'unbounded' }, 0, 0), point({ name: 'Road out' }, 0, 0)));
    expect(shelters.map((s) => s.attributes.capacityPersons)).toEqual([300, null, null]);
    const f = failure(() => readShelters(collection(point({ name: 'x', capacityPersons: 'lots' }, 0, 0), { type: 'Feature', properties: {}, geometry: { type: 'LineString', coordinates: [] } })));
    expect(f.badFeatures.map((b) => b.index)).toEqual([0, 1]);
  });

  it('attaches a shelter to the nearest local-road node and an exit to any node, a motorway included', () => {
    const shelters = readShelters(collection(point({ name: 'School', capacityPersons: 500 }, 195, 45), point({ name: 'Exit', capacityPersons: null }, 195, 45)));
    const [school, exit] = attachShelters(index, shelters);
    expect(school!.node).toBe(nodeAt(200, 0));
    expect(school!.distanceMeters).toBeCloseTo(Math.hypot(5, 45), 0);
    expect(exit!.node).toBe(nodeAt(200, 50));
    expect(exit!.distanceMeters).toBeCloseTo(Math.hypot(5, 5), 0);
  });

  it('fails with each shelter that has no node within the distance', () => {
    const shelters = readShelters(collection(point({ name: 'Near', capacityPersons: 10 }, 0, 10), point({ name: 'Island', capacityPersons: 10 }, 3000, 0)));
    const f = failure(() => attachShelters(index, shelters, { shelterMaxDistanceMeters: 500 }));
    expect(f.code).toBe('attachmentFailed');
    expect(f.badFeatures).toEqual([{ index: 1, id: null, problem: '"Island" has no road node within 500 m' }]);
  });
});
