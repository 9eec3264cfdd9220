// Writes the generated county's files: `npm run county:generate [-- --size N --seed S --out DIR]`.
// Defaults: the full county (300 × 300, seed 15) into tests/output/county/ (git-ignored; the
// files are generated, never committed). Prints each file's path, features and bytes as JSON.
import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseArgs } from 'node:util';
import { countyRoads, countyShelters, countyZones, FULL_COUNTY, type CountySpec } from './county';

const here = dirname(fileURLToPath(import.meta.url));
export const DEFAULT_COUNTY_DIR = resolve(here, '../../output/county');

export interface CountyFiles {
  roads: string;
  zones: string;
  shelters: string;
}

/** Writes roads.geojson, zones.geojson and shelters.geojson into `dir`; returns their paths. */
export function writeCountyFiles(spec: CountySpec, dir: string): CountyFiles & { features: Record<keyof CountyFiles, number>; bytes: Record<keyof CountyFiles, number> } {
  mkdirSync(dir, { recursive: true });
  const collections = { roads: countyRoads(spec), zones: countyZones(spec), shelters: countyShelters(spec) };
  const paths = {} as CountyFiles;
  const features = {} as Record<keyof CountyFiles, number>;
  const bytes = {} as Record<keyof CountyFiles, number>;
  for (const key of ['roads', 'zones', 'shelters'] as const) {
    const text = `${JSON.stringify(collections[key])}\n`;
    paths[key] = join(dir, `${key}.geojson`);
    writeFileSync(paths[key], text);
    features[key] = collections[key].features.length;
    bytes[key] = Buffer.byteLength(text);
  }
  return { ...paths, features, bytes };
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const { values } = parseArgs({ options: { size: { type: 'string' }, seed: { type: 'string' }, out: { type: 'string' } } });
  const spec: CountySpec = { size: Number(values.size ?? FULL_COUNTY.size), seed: Number(values.seed ?? FULL_COUNTY.seed) };
  if (!Number.isInteger(spec.size) || spec.size < 12 || !Number.isInteger(spec.seed)) throw new Error('--size must be an integer ≥ 12 and --seed an integer');
  console.log(JSON.stringify({ spec, ...writeCountyFiles(spec, resolve(values.out ?? DEFAULT_COUNTY_DIR)) }, null, 2));
}
