// Local types for osmtogeojson 2.2 (a CommonJS module: `module.exports = osmtogeojson`).
// @types/osmtogeojson declares a default export, which has no call signature here.
declare module 'osmtogeojson' {
  import type { FeatureCollection, Geometry } from 'geojson';

  namespace osmtogeojson {
    interface Options {
      /** Put tags and meta directly in `properties` instead of `properties.tags`/`.meta`. */
      flatProperties?: boolean;
      /** Tags that do not make a node a feature of its own. */
      uninterestingTags?: Record<string, boolean> | ((tags: Record<string, string>, ignoreTags: Record<string, boolean>) => boolean);
      /** Decides whether a closed way is an area (Polygon) rather than a LineString. */
      polygonFeatures?: Record<string, unknown> | ((tags: Record<string, string>) => boolean);
      verbose?: boolean;
    }
  }

  /** Converts an OSM JSON object (Overpass/API `{ elements }`) or an XML DOM document. */
  function osmtogeojson(data: unknown, options?: osmtogeojson.Options): FeatureCollection<Geometry>;
  export = osmtogeojson;
}
