// Road layers, zones and shelters → the routable network. Pure (turf for geodesy); file
// reading and OSM decoding live in server/import.
export { buildRoadGraph, type RoadGraph, type RoadSourceContext } from './build-road-graph';
export { RoadImportError } from './road-import-error';
export { readRoadTags, type RoadReading, type Tags } from './read-road-tags';
export { readMappedProperties, tagsOf } from './read-mapped-properties';
export { parseLaneCount, parseLayer, parseOneway, parseSpeedKmh } from './parse-tag-values';
export { pathLengthMeters } from './cut-into-segments';
export { readZones, type ZoneFeature } from './read-zones';
export { readShelters, type ShelterFeature } from './read-shelters';
export { indexNodes, nearestNode, type NodeIndex } from './node-index';
export {
  attachShelters,
  attachZones,
  DEFAULT_SHELTER_MAX_DISTANCE_METERS,
  DEFAULT_ZONE_MAX_DISTANCE_METERS,
  type AttachOptions,
} from './attach-zones-and-shelters';
export { reportFindingsToGeoJson, segmentsToGeoJson, type FindingKind } from './road-graph-to-geojson';
