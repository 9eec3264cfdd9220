// Which road junctions a zone feeds and a shelter takes from, in words.
import type { Attachments } from '@shared/api/zones-shelters';
import { formatCount } from '@shared/format/numbers';
import { screenLength } from './preferences';

type ZoneAttachment = Attachments['zones'][number];
type ShelterAttachment = Attachments['shelters'][number];

export function zoneAttachmentText(a: ZoneAttachment | undefined): { text: string; problem: boolean } {
  if (!a) return { text: 'Not attached to the roads yet.', problem: true };
  if (a.problem) return { text: a.problem, problem: true };
  if (a.nodes.length === 0) return { text: 'No road junction to leave from.', problem: true };
  if (a.attachedBy === 'inside') return { text: `Leaves by ${formatCount(a.nodes.length)} road ${a.nodes.length === 1 ? 'junction' : 'junctions'} inside the zone.`, problem: false };
  return { text: `No road inside: joined to the nearest junction, ${screenLength(a.distanceMeters)} away.`, problem: a.distanceMeters > 500 };
}

export function shelterAttachmentText(a: ShelterAttachment | undefined): { text: string; problem: boolean } {
  if (!a) return { text: 'Not attached to the roads yet.', problem: true };
  if (a.problem) return { text: a.problem, problem: true };
  if (!a.node) return { text: 'No road junction nearby.', problem: true };
  return { text: `Reached from junction ${a.node.index}, ${screenLength(a.distanceMeters)} away.`, problem: a.distanceMeters > 500 };
}
