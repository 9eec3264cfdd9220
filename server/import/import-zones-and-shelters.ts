// Zone and shelter uploads: read (any format readGisFile reads), columns mapped, checked, and
// attached to a built road network in one call.
import type { ShelterUploadOptions, ZoneUploadOptions } from '../../shared/api/road-import';
import type { ShelterAttachment, ZoneAttachment } from '../../shared/api/zone-shelter-attributes';
import { attachShelters, attachZones, type AttachOptions } from '../../shared/geo/attach-zones-and-shelters';
import type { RoadGraph } from '../../shared/geo/build-road-graph';
import { indexNodes, type NodeIndex } from '../../shared/geo/node-index';
import { readShelters, type ShelterFeature } from '../../shared/geo/read-shelters';
import { readZones, type ZoneFeature } from '../../shared/geo/read-zones';
import { RoadImportError } from '../../shared/geo/road-import-error';
import { applyShelterFields, applyZoneFields } from '../../shared/geo/apply-field-mapping';
import { readGisFile, withCrsQuestion, type GisFeatures } from './gis/read-gis-file';

type AttachableNetwork = Pick<RoadGraph, 'nodes' | 'segments'> | NodeIndex;

function indexOf(network: AttachableNetwork): NodeIndex {
  return 'grid' in network ? network : indexNodes(network);
}

async function featuresOf(bytes: Uint8Array, options: ZoneUploadOptions | ShelterUploadOptions, fileName: string, what: string): Promise<GisFeatures> {
  const reading = await readGisFile(bytes, { ...options.source, fileName });
  if (reading.kind === 'osm') throw new RoadImportError('unreadableFile', `${fileName}: an OpenStreetMap file holds roads, not ${what}`);
  return reading;
}

/** Zones from any format, columns mapped. @throws RoadImportError `unreadableFile` | `wrongCrs` | `badFeatures` */
export async function readZonesUpload(bytes: Uint8Array, options: ZoneUploadOptions = {}, fileName = 'zones'): Promise<ZoneFeature[]> {
  const reading = await featuresOf(bytes, options, fileName, 'zones');
  return withCrsQuestion(reading, fileName, () => readZones(applyZoneFields(reading.collection, options.fields, reading.format === 'csv')));
}

/** Shelters from any format, columns mapped. @throws RoadImportError `unreadableFile` | `wrongCrs` | `badFeatures` */
export async function readSheltersUpload(bytes: Uint8Array, options: ShelterUploadOptions = {}, fileName = 'shelters'): Promise<ShelterFeature[]> {
  const reading = await featuresOf(bytes, options, fileName, 'shelters');
  return withCrsQuestion(reading, fileName, () => readShelters(applyShelterFields(reading.collection, options.fields)));
}

/** @throws RoadImportError `unreadableFile` | `wrongCrs` | `badFeatures` | `attachmentFailed` */
export async function importZones(bytes: Uint8Array, network: AttachableNetwork, options: AttachOptions = {}, fileName = 'zones', upload: ZoneUploadOptions = {}): Promise<{ zones: ZoneFeature[]; attachments: ZoneAttachment[] }> {
  const zones = await readZonesUpload(bytes, upload, fileName);
  return { zones, attachments: attachZones(indexOf(network), zones, options) };
}

/** @throws RoadImportError `unreadableFile` | `wrongCrs` | `badFeatures` | `attachmentFailed` */
export async function importShelters(bytes: Uint8Array, network: AttachableNetwork, options: AttachOptions = {}, fileName = 'shelters', upload: ShelterUploadOptions = {}): Promise<{ shelters: ShelterFeature[]; attachments: ShelterAttachment[] }> {
  const shelters = await readSheltersUpload(bytes, upload, fileName);
  return { shelters, attachments: attachShelters(indexOf(network), shelters, options) };
}
