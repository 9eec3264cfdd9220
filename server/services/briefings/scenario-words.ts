// A scenario's overlay in words for the briefing's assumptions, so that a scenario run's
// briefing says what was changed from the plan's own data. Pure.
import type { ScenarioOverlay } from '../../../shared/api/scenarios';
import { formatDecimal, formatDuration } from '../../../shared/format/numbers';

export type ScenarioNames = { segment: (id: number) => string; zone: (id: number) => string; shelter: (id: number) => string };

function list(items: string[], max = 6): string {
  return items.length <= max ? items.join(', ') : `${items.slice(0, max).join(', ')} and ${items.length - max} more`;
}

export function scenarioChanges(o: ScenarioOverlay, names: ScenarioNames): string[] {
  const out: string[] = [];
  if (o.closures.length) {
    const when = (c: ScenarioOverlay['closures'][number]) =>
      c.fromMinutes === 0 && c.untilMinutes === null ? '' : c.untilMinutes === null ? ` from ${formatDuration(c.fromMinutes)}` : ` ${formatDuration(c.fromMinutes)}–${formatDuration(c.untilMinutes)}`;
    out.push(`closed: ${list(o.closures.map((c) => `${names.segment(c.segmentId)}${when(c)}`))}`);
  }
  if (o.laneChanges.length) out.push(`lanes or speeds changed on ${list(o.laneChanges.map((c) => names.segment(c.segmentId)))}`);
  for (const c of o.contraflow) out.push(`contraflow “${c.name}” on ${c.segmentIds.length} segments`);
  if (o.classFactors.length) out.push(`capacity × ${list(o.classFactors.map((f) => `${formatDecimal(f.factor)} on ${f.roadClass.replace(/_/g, ' ')}`))}`);
  if (o.removedShelterIds.length) out.push(`shelters left out: ${list(o.removedShelterIds.map(names.shelter))}`);
  if (o.addedShelters.length) out.push(`shelters added: ${list(o.addedShelters.map((s) => s.name))}`);
  if (o.departureDelays.length) out.push(`later departures: ${list(o.departureDelays.map((d) => `${names.zone(d.zoneId)} +${formatDuration(d.delayMinutes)}`))}`);
  if (o.departureSchedules.length) out.push(`departure schedules for ${list(o.departureSchedules.map((d) => names.zone(d.zoneId)))}`);
  return out;
}
