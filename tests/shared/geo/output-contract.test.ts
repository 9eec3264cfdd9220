// What the importer returns is exactly what the API contract (shared/api/road-attributes.ts) accepts,
// for every kind of input: the demo town, a real OSM extract, a GIS layer, synthetic OSM.
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { importReportSchema, propertyMappingSchema } from '../../../shared/api/road-import';
import { networkNodeSchema, networkSegmentSchema } from '../../../shared/api/road-attributes';
import { importRoadLayer } from '../../../server/import/import-road-layer';

const read = (path: string) => readFileSync(new URL(path, import.meta.url));
const inputs: [string, Uint8Array, Parameters<typeof importRoadLayer>[1]][] = [
  ['demo town', read('../../../server/seed/demo-town/roads.geojson'), {}],
  ['West Oakland', read('../../fixtures/osm/West-Oakland.osm.bz2'), {}],
  ['tag rules', read('../../fixtures/osm/tag-rules.osm'), {}],
  ['GIS layer', read('../../fixtures/geo/gis-no-shared-vertices.geojson'), { propertyMapping: propertyMappingSchema.parse(JSON.parse(read('../../fixtures/geo/gis-no-shared-vertices.mapping.json').toString())) }],
];

describe('import output contract', () => {
  for (const [name, bytes, options] of inputs) {
    it(`${name}: report, nodes and segments pass their schemas and refer to each other`, () => {
      const network = importRoadLayer(bytes, options, name);
      expect(importReportSchema.parse(network.report)).toEqual(network.report);
      for (const n of network.nodes) networkNodeSchema.parse(n);
      for (const s of network.segments) {
        expect(networkSegmentSchema.parse(s)).toEqual(s);
        expect(s.fromNode).toBeLessThan(network.nodes.length);
        expect(s.toNode).toBeLessThan(network.nodes.length);
        expect(s.fromNode).not.toBe(s.toNode);
        expect(s.coordinates[0]).toEqual([network.nodes[s.fromNode]!.lon, network.nodes[s.fromNode]!.lat]);
        expect(s.coordinates[s.coordinates.length - 1]).toEqual([network.nodes[s.toNode]!.lon, network.nodes[s.toNode]!.lat]);
      }
      expect(network.report.segmentCount).toBe(network.segments.length);
      expect(network.report.nodeCount).toBe(network.nodes.length);
      expect(network.report.kept.reduce((sum, k) => sum + k.segments, 0)).toBe(network.segments.length);
      // Serialisable as plain JSON, unchanged.
      expect(JSON.parse(JSON.stringify(network))).toEqual(network);
    });
  }
});
