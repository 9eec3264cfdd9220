// Shelter and exit uploads: GeoJSON points with a name and a capacity in persons.
import { shelterAttributesSchema, type ShelterAttributes } from '../api/zone-shelter-attributes';
import { type BadFeature } from '../api/road-import';
import { type LonLat } from '../api/road-attributes';
import { failOnBadFeatures, geometryTypeName, preview, readFeatureCollection, readPosition } from './check-feature-collection';
import { issues, nameOf, numeric, present } from './read-zones';
import { RoadImportError } from './road-import-error';

export interface ShelterFeature {
  index: number;
  id: string | null;
  attributes: ShelterAttributes;
  coordinates: LonLat;
}

/**
 * Shelters and exits from GeoJSON points. Properties: name, capacityPersons (a whole
 * number; empty, null or "unbounded" for an exit without limit).
 * @throws RoadImportError `unreadableFile` | `wrongCrs` | `badFeatures`
 */
export function readShelters(input: unknown): ShelterFeature[] {
  const features = readFeatureCollection(input, 'Shelters');
  if (features.length === 0) throw new RoadImportError('unreadableFile', 'Shelters: the file has no features; nothing was imported');
  const bad: BadFeature[] = [];
  const shelters: ShelterFeature[] = [];
  for (const f of features) {
    const g = f.geometry as { type?: unknown; coordinates?: unknown } | null;
    if (!g || g.type !== 'Point') {
      bad.push({ index: f.index, id: f.id, problem: `a shelter must be a Point, not ${geometryTypeName(g)}` });
      continue;
    }
    const pos = readPosition(g.coordinates);
    if (typeof pos === 'string') {
      bad.push({ index: f.index, id: f.id, problem: `bad position ${preview(g.coordinates)}` });
      continue;
    }
    const p = f.properties;
    const raw = p['capacityPersons'];
    const capacity = !present(raw) || raw === 'unbounded' ? null : numeric(raw);
    const parsed = shelterAttributesSchema.safeParse({
      name: nameOf(p['name'], f.id ?? `Shelter ${f.index + 1}`),
      capacityPersons: capacity,
    });
    if (!parsed.success) bad.push({ index: f.index, id: f.id, problem: issues(parsed.error) });
    else shelters.push({ index: f.index, id: f.id, attributes: parsed.data, coordinates: pos });
  }
  failOnBadFeatures('Shelters', bad, 0, features.length);
  return shelters;
}
