// Zone and shelter uploads, read and attached to a built road network in one call.
import type { ShelterAttachment, ZoneAttachment } from '../../shared/api/zone-shelter-attributes';
import { attachShelters, attachZones, type AttachOptions } from '../../shared/geo/attach-zones-and-shelters';
import type { RoadGraph } from '../../shared/geo/build-road-graph';
import { indexNodes, type NodeIndex } from '../../shared/geo/node-index';
import { readShelters, type ShelterFeature } from '../../shared/geo/read-shelters';
import { readZones, type ZoneFeature } from '../../shared/geo/read-zones';
import { readGeoJsonUpload } from './decode-upload';

type AttachableNetwork = Pick<RoadGraph, 'nodes' | 'segments'> | NodeIndex;

function indexOf(network: AttachableNetwork): NodeIndex {
  return 'grid' in network ? network : indexNodes(network);
}

/** @throws RoadImportError `unreadableFile` | `wrongCrs` | `badFeatures` | `attachmentFailed` */
export function importZones(bytes: Uint8Array, network: AttachableNetwork, options: AttachOptions = {}, fileName = 'zones'): { zones: ZoneFeature[]; attachments: ZoneAttachment[] } {
  const zones = readZones(readGeoJsonUpload(bytes, fileName));
  return { zones, attachments: attachZones(indexOf(network), zones, options) };
}

/** @throws RoadImportError `unreadableFile` | `wrongCrs` | `badFeatures` | `attachmentFailed` */
export function importShelters(bytes: Uint8Array, network: AttachableNetwork, options: AttachOptions = {}, fileName = 'shelters'): { shelters: ShelterFeature[]; attachments: ShelterAttachment[] } {
  const shelters = readShelters(readGeoJsonUpload(bytes, fileName));
  return { shelters, attachments: attachShelters(indexOf(network), shelters, options) };
}
