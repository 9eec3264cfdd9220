// `npm run --silent network -- FILE [options]`: imports a road layer (any format the upload
// reads: GeoJSON, zipped Shapefile, GeoPackage, KML/KMZ, OSM XML/JSON/PBF) and prints one JSON object summarising the network built from it. With
// `--dimacs OUT --zones Z.geojson --shelters S.geojson` it also writes the static s–t network
// (veh/h capacities, super source and sink) in the DIMACS max-flow format for audit.
import { createWriteStream } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { once } from 'node:events';
import { parseArgs } from 'node:util';
import { parseFieldMappingFile, type FieldMapping, type ImportOptionsInput } from '../../shared/api/road-import';
import { dimacsMaxFlowChunks } from '../../shared/flow';
import { indexNodes } from '../../shared/geo/node-index';
import { RoadImportError } from '../../shared/geo/road-import-error';
import { defaultCapacityTable } from '../../shared/model';
import { importRoadLayerFile } from '../import/import-road-layer';
import { importShelters, importZones } from '../import/import-zones-and-shelters';
import { staticNetworkDimacs } from './static-dimacs';
import { summariseNetwork } from './summarise-road-graph';

const USAGE = `usage: npm run --silent network -- FILE [--snap-meters M] [--split-crossings | --no-split-crossings]
       [--tiny-meters M] [--mapping MAPPING.json] [--layer NAME] [--crs EPSG:NNNN]
       [--dimacs OUT.max --zones ZONES --shelters SHELTERS]
The mapping file is the upload dialog's mapping: {"roads": {...}, "source": {...}, "zones": {...},
"shelters": {...}} (a bare road mapping also works). Zones and shelters may be any format too.`;

async function main(): Promise<number> {
  const { values, positionals } = parseArgs({
    allowPositionals: true,
    options: {
      'snap-meters': { type: 'string' },
      'split-crossings': { type: 'boolean' },
      'no-split-crossings': { type: 'boolean' },
      'tiny-meters': { type: 'string' },
      mapping: { type: 'string' },
      layer: { type: 'string' },
      crs: { type: 'string' },
      dimacs: { type: 'string' },
      zones: { type: 'string' },
      shelters: { type: 'string' },
      help: { type: 'boolean', short: 'h' },
    },
  });
  const file = positionals[0];
  if (values.help || !file || positionals.length > 1) {
    console.error(USAGE);
    return values.help ? 0 : 2;
  }
  if (values.dimacs && (!values.zones || !values.shelters)) {
    console.error('--dimacs needs --zones and --shelters (the super source feeds the zones, the super sink drains the shelters)');
    return 2;
  }
  const options: ImportOptionsInput = {};
  if (values['snap-meters'] !== undefined) options.snapToleranceMeters = Number(values['snap-meters']);
  if (values['tiny-meters'] !== undefined) options.tinySegmentMeters = Number(values['tiny-meters']);
  if (values['split-crossings']) options.splitAtCrossings = true;
  if (values['no-split-crossings']) options.splitAtCrossings = false;
  const mapping: FieldMapping = values.mapping ? parseFieldMappingFile(JSON.parse(await readFile(values.mapping, 'utf8'))) : {};
  if (mapping.roads) options.propertyMapping = mapping.roads;
  const source = { ...mapping.source, ...(values.layer ? { layer: values.layer } : {}), ...(values.crs ? { crs: values.crs } : {}) };
  if (Object.keys(source).length > 0) options.source = source;

  const started = performance.now();
  const network = await importRoadLayerFile(file, options);
  const importSeconds = (performance.now() - started) / 1000;
  const table = defaultCapacityTable();
  const summary: Record<string, unknown> = { file, importSeconds: Math.round(importSeconds * 1000) / 1000, ...summariseNetwork(network, table) };

  if (values.dimacs && values.zones && values.shelters) {
    const index = indexNodes(network);
    const z = await importZones(await readFile(values.zones), index, {}, values.zones, { fields: mapping.zones });
    const s = await importShelters(await readFile(values.shelters), index, {}, values.shelters, { fields: mapping.shelters });
    const { dimacs, comments, built } = staticNetworkDimacs(network, table, z, s, file);
    const out = createWriteStream(values.dimacs);
    for (const chunk of dimacsMaxFlowChunks(dimacs, comments)) if (!out.write(chunk)) await once(out, 'drain');
    out.end();
    await once(out, 'finish');
    summary['dimacs'] = {
      file: values.dimacs,
      nodes: dimacs.nodeCount,
      arcs: dimacs.tails.length,
      source: dimacs.source + 1,
      sink: dimacs.sink + 1,
      capacityUnit: 'veh/h',
      zones: built.zones,
      shelters: built.shelters,
      zoneEntryNodes: z.attachments.map((a) => ({ zone: z.zones[a.zoneIndex]!.attributes.name, nodes: a.entryNodes.length, attachedBy: a.attachedBy })),
      shelterNodes: s.attachments.map((a) => ({ shelter: s.shelters[a.shelterIndex]!.attributes.name, node: a.node, distanceMeters: Math.round(a.distanceMeters * 10) / 10 })),
    };
  }
  console.log(JSON.stringify(summary, null, 2));
  return 0;
}

main().then(
  (code) => process.exit(code),
  (error: unknown) => {
    if (error instanceof RoadImportError) {
      console.log(JSON.stringify({ error: error.failure }, null, 2));
      process.exit(1);
    }
    console.error(error);
    process.exit(1);
  },
);
