// PostGIS geometry columns. Values are written as SQL (ST_GeomFromText / ST_GeomFromGeoJSON) by
// the services that insert them, and read back with ST_AsGeoJSON, so the driver value is text.
import { customType } from 'drizzle-orm/pg-core';

export function geometry(type: 'Point' | 'LineString' | 'Polygon' | 'MultiPolygon') {
  return customType<{ data: string; driverData: string }>({
    dataType: () => `geometry(${type},4326)`,
  });
}
