// One export bundle → the bytes of one file format. GeoJSON holds one table (a FeatureCollection
// has no layers); GeoPackage, zipped Shapefile and KML hold them all.
import type { ExportBundle } from '../../shared/format/export-tables';
import { checkTable } from '../../shared/format/export-tables';
import { writeGeoJson } from './write-geojson';
import { writeGeoPackage } from './write-geopackage';
import { writeKml } from './write-kml';
import { writeShapefileZip } from './write-shapefile-zip';

export const exportFormats = ['geojson', 'gpkg', 'shp.zip', 'kml'] as const;
export type ExportFormat = (typeof exportFormats)[number];

export const exportContentTypes: Record<ExportFormat, string> = {
  geojson: 'application/geo+json',
  gpkg: 'application/geopackage+sqlite3',
  'shp.zip': 'application/zip',
  kml: 'application/vnd.google-earth.kml+xml',
};

const encoder = new TextEncoder();

/** `table`: the one table a GeoJSON file holds (by name); the other formats take every table. */
export async function writeExport(format: ExportFormat, bundle: ExportBundle, table?: string): Promise<Uint8Array> {
  bundle.tables.forEach(checkTable);
  switch (format) {
    case 'geojson': {
      const t = bundle.tables.find((x) => x.name === table);
      if (!t) throw new Error(`no table ${table} to write as GeoJSON`);
      return encoder.encode(writeGeoJson(bundle, t));
    }
    case 'gpkg':
      return writeGeoPackage(bundle);
    case 'shp.zip':
      return writeShapefileZip(bundle);
    case 'kml':
      return encoder.encode(writeKml(bundle));
  }
}
