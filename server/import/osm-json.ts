// The OpenStreetMap JSON shape (Overpass API / OSM API 0.6 `{ elements: [...] }`), the form
// osmtogeojson reads. Only nodes and ways matter for roads.

export interface OsmNode {
  type: 'node';
  id: number;
  lat: number;
  lon: number;
  tags?: Record<string, string>;
}

export interface OsmWay {
  type: 'way';
  id: number;
  nodes: number[];
  tags?: Record<string, string>;
  /** Overpass `out geom`: positions alongside the node ids. */
  geometry?: ({ lat: number; lon: number } | null)[];
}

export interface OsmRelation {
  type: 'relation';
  id: number;
  tags?: Record<string, string>;
}

export type OsmElement = OsmNode | OsmWay | OsmRelation;

export interface OsmJson {
  elements: OsmElement[];
}
