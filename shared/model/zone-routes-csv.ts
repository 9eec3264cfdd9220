// "Where each zone goes" as CSV: one row per zone and road its vehicles use, with the zone's
// shelters and time windows repeated on each row so any row can be read alone. Leading comment
// lines carry what every export carries (shared/model/export-identity: the caution first, the
// plan) and the search's own identity and the sentence that an optimum is not a plan; cells are
// written by shared/model/csv (formula guard).
import type { z } from 'zod';
import type { zoneRoutesAnswerSchema } from '../api/proposals';
import { csvComments, toCsv, type CsvValue } from './csv';
import { identityLines, type ExportIdentity } from './export-identity';

type ZoneRoutesAnswer = z.infer<typeof zoneRoutesAnswerSchema>;

export const zoneRoutesCsvHeader = [
  'zone_id',
  'zone',
  'zone_vehicles',
  'delivered_vehicles',
  'shelters',
  'departures_from_min',
  'departures_until_min',
  'arrivals_from_min',
  'arrivals_until_min',
  'segment_id',
  'direction',
  'road',
  'road_class',
  'road_vehicles',
  'main_corridor',
];

export function zoneRoutesCsv(answer: ZoneRoutesAnswer, identity: ExportIdentity): string {
  const rows: CsvValue[][] = [];
  for (const zone of answer.zones) {
    const shelters = zone.shelters.map((s) => `${s.name} (${s.vehicles})`).join('; ');
    const main = new Set(zone.mainRoads.map((r) => `${r.segmentId}:${r.direction}`));
    const head: CsvValue[] = [
      zone.zoneId,
      zone.name,
      zone.vehicles,
      zone.deliveredVehicles,
      shelters,
      zone.departureWindowMinutes?.[0] ?? null,
      zone.departureWindowMinutes?.[1] ?? null,
      zone.arrivalWindowMinutes?.[0] ?? null,
      zone.arrivalWindowMinutes?.[1] ?? null,
    ];
    if (zone.roads.length === 0) rows.push([...head, null, null, null, null, null, null]);
    for (const r of zone.roads) rows.push([...head, r.segmentId, r.direction, r.name, r.roadClass, r.vehicles, main.has(`${r.segmentId}:${r.direction}`)]);
  }
  return csvComments(identityLines(identity)) + toCsv(zoneRoutesCsvHeader, rows);
}
