// How long each export writer takes on a county-sized road layer: synthetic roads (a grid of
// three-vertex segments, the generated county's count by default), a hundred zones and shelters,
// each format written once in this process. Prints time, size and the process's peak RSS.
//   npx tsx tests/bench/export/write-files.ts [--roads 179108] [--formats gpkg,shp.zip,kml,geojson]
import { loadavg } from 'node:os';
import { defaultCapacityTable } from '../../../shared/model/capacity-defaults';
import { roadInputsTable, shelterInputsTable, zoneInputsTable, type RoadInput } from '../../../shared/format/inputs-export';
import type { ExportBundle } from '../../../shared/format/export-tables';
import { writeExport, type ExportFormat } from '../../../server/export/write-export';

const arg = process.argv.indexOf('--roads');
const count = arg > 0 ? Number(process.argv[arg + 1]) : 179_108;
const side = Math.ceil(Math.sqrt(count));
const roads: RoadInput[] = [];
for (let i = 0; i < count; i++) {
  const x = -100 + (i % side) * 0.001;
  const y = 40 + Math.floor(i / side) * 0.001;
  roads.push({
    id: i + 1,
    coordinates: [[x, y], [x + 0.0004, y + 0.0001], [x + 0.001, y]],
    lengthMeters: 90,
    sourceId: `way/${i}`,
    attributes: { roadClass: 'residential', lanesForward: 1, lanesBackward: 1, oneway: false, speedKmh: null, name: `Street ${i % 500}`, bridge: false, tunnel: false, layer: 0, closed: false, capacityOverrideVehPerHourPerLane: null },
  });
}
const square = (x: number, y: number): [number, number][][] => [[[x, y], [x + 0.01, y], [x + 0.01, y + 0.01], [x, y + 0.01], [x, y]]];
const bundle: ExportBundle = {
  identity: [['caution', 'A planning aid, not an order.'], ['contents', 'bench']],
  tables: [
    roadInputsTable(roads, defaultCapacityTable(), 'us-customary'),
    zoneInputsTable(Array.from({ length: 100 }, (_, i) => ({ id: i, name: `Zone ${i}`, population: 1000, participationRate: 0.9, personsPerVehicle: 2.5, departureCurve: { kind: 'allAtOnce' as const }, geometry: { type: 'Polygon' as const, coordinates: square(-100 + i * 0.01, 40) } }))),
    shelterInputsTable(Array.from({ length: 100 }, (_, i) => ({ id: i, name: `Shelter ${i}`, capacityPersons: 500, lon: -100 + i * 0.01, lat: 40.5 }))),
  ],
};

let peak = process.memoryUsage().rss;
const sampler = setInterval(() => (peak = Math.max(peak, process.memoryUsage().rss)), 50);
console.log(`${count.toLocaleString('en')} roads; load average ${loadavg().map((l) => l.toFixed(1)).join(' ')}`);
const only = process.argv.indexOf('--formats');
const formats = (only > 0 ? process.argv[only + 1]!.split(',') : ['gpkg', 'shp.zip', 'kml', 'geojson']) as ExportFormat[];
for (const format of formats) {
  const start = performance.now();
  const bytes = await writeExport(format, bundle, 'roads');
  const ms = performance.now() - start;
  peak = Math.max(peak, process.memoryUsage().rss);
  console.log(`${format.padEnd(8)} ${(ms / 1000).toFixed(1).padStart(6)} s  ${(bytes.length / 1e6).toFixed(1).padStart(7)} MB  peak RSS so far ${(peak / 1e6).toFixed(0)} MB`);
}
clearInterval(sampler);
