// Writes the demo town's layers next to this file: `npx tsx server/seed/demo-town/generate.ts`.
// The output is committed; rerun after changing demo-town.ts.
import { writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { demoRoads, demoShelters, demoZones } from './demo-town';

const here = dirname(fileURLToPath(import.meta.url));
const files = { 'roads.geojson': demoRoads(), 'zones.geojson': demoZones(), 'shelters.geojson': demoShelters() };
for (const [name, collection] of Object.entries(files)) {
  writeFileSync(join(here, name), `${JSON.stringify(collection)}\n`);
  console.log(`${name}: ${collection.features.length} features`);
}
