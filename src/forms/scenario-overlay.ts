// Editing a scenario's overlay: each change the editor's tools make, as a pure function from one
// overlay to the next (the base data is never touched), validation with the server's schema,
// and the overlay in words and per segment for the map.
import { scenarioOverlaySchema, type ScenarioOverlay } from '@shared/api/scenarios';
import type { RoadClass } from '@shared/api/road-attributes';
import type { ShelterCreate } from '@shared/api/zones-shelters';
import { formatDuration } from '@shared/format/numbers';
import { parseForm, type FieldErrors } from './zod-errors';

export type Direction = 'forward' | 'backward';
export type LanePatch = ScenarioOverlay['laneChanges'][number]['patch'];

export const emptyOverlay = (): ScenarioOverlay => scenarioOverlaySchema.parse({});

/** Closes a road from the start, or takes its closure away again when it has one. */
export function toggleClosure(overlay: ScenarioOverlay, segmentId: number): ScenarioOverlay {
  const has = overlay.closures.some((c) => c.segmentId === segmentId);
  return {
    ...overlay,
    closures: has ? overlay.closures.filter((c) => c.segmentId !== segmentId) : [...overlay.closures, { segmentId, fromMinutes: 0, untilMinutes: null }],
  };
}

export function setClosureTimes(overlay: ScenarioOverlay, segmentId: number, fromMinutes: number, untilMinutes: number | null): ScenarioOverlay {
  return { ...overlay, closures: overlay.closures.map((c) => (c.segmentId === segmentId ? { segmentId, fromMinutes, untilMinutes } : c)) };
}

/** Sets the lane change of a road; an empty patch removes it. */
export function setLaneChange(overlay: ScenarioOverlay, segmentId: number, patch: LanePatch): ScenarioOverlay {
  const clean = Object.fromEntries(Object.entries(patch).filter(([, v]) => v !== undefined && v !== null)) as LanePatch;
  const rest = overlay.laneChanges.filter((l) => l.segmentId !== segmentId);
  return { ...overlay, laneChanges: Object.keys(clean).length === 0 ? rest : [...rest, { segmentId, patch: clean }] };
}

/** Adds a road to the named corridor (made with this direction when new), or takes it out when it is in. */
export function toggleCorridorSegment(overlay: ScenarioOverlay, name: string, segmentId: number, direction: Direction): ScenarioOverlay {
  const corridor = overlay.contraflow.find((c) => c.name === name);
  if (!corridor) return { ...overlay, contraflow: [...overlay.contraflow, { name, segmentIds: [segmentId], direction }] };
  const has = corridor.segmentIds.includes(segmentId);
  const segmentIds = has ? corridor.segmentIds.filter((id) => id !== segmentId) : [...corridor.segmentIds, segmentId];
  return {
    ...overlay,
    contraflow: segmentIds.length === 0 ? overlay.contraflow.filter((c) => c !== corridor) : overlay.contraflow.map((c) => (c === corridor ? { ...c, segmentIds } : c)),
  };
}

export function setCorridorDirection(overlay: ScenarioOverlay, name: string, direction: Direction): ScenarioOverlay {
  return { ...overlay, contraflow: overlay.contraflow.map((c) => (c.name === name ? { ...c, direction } : c)) };
}

export function removeCorridor(overlay: ScenarioOverlay, name: string): ScenarioOverlay {
  return { ...overlay, contraflow: overlay.contraflow.filter((c) => c.name !== name) };
}

/** "Corridor 1", "Corridor 2"…: the first name not taken. */
export function nextCorridorName(overlay: ScenarioOverlay): string {
  for (let i = 1; ; i++) if (!overlay.contraflow.some((c) => c.name === `Corridor ${i}`)) return `Corridor ${i}`;
}

/** A factor on one road class's capacity; 1 (or no value) removes it. */
export function setClassFactor(overlay: ScenarioOverlay, roadClass: RoadClass, factor: number | null): ScenarioOverlay {
  const rest = overlay.classFactors.filter((f) => f.roadClass !== roadClass);
  return { ...overlay, classFactors: factor === null || factor === 1 ? rest : [...rest, { roadClass, factor }] };
}

export function toggleRemovedShelter(overlay: ScenarioOverlay, shelterId: number): ScenarioOverlay {
  const has = overlay.removedShelterIds.includes(shelterId);
  return { ...overlay, removedShelterIds: has ? overlay.removedShelterIds.filter((id) => id !== shelterId) : [...overlay.removedShelterIds, shelterId] };
}

export function addShelter(overlay: ScenarioOverlay, shelter: ShelterCreate): ScenarioOverlay {
  return { ...overlay, addedShelters: [...overlay.addedShelters, shelter] };
}

export function removeAddedShelter(overlay: ScenarioOverlay, index: number): ScenarioOverlay {
  return { ...overlay, addedShelters: overlay.addedShelters.filter((_, i) => i !== index) };
}

/** A zone leaves this many minutes after the order; 0 (or no value) removes the delay. */
export function setDepartureDelay(overlay: ScenarioOverlay, zoneId: number, delayMinutes: number | null): ScenarioOverlay {
  const rest = overlay.departureDelays.filter((d) => d.zoneId !== zoneId);
  return { ...overlay, departureDelays: delayMinutes === null || delayMinutes === 0 ? rest : [...rest, { zoneId, delayMinutes }] };
}

/** Checks the overlay with the schema the server uses; errors keyed by path (closures.0.untilMinutes). */
export function validateOverlay(overlay: ScenarioOverlay): { ok: true; value: ScenarioOverlay } | { ok: false; errors: FieldErrors } {
  return parseForm(scenarioOverlaySchema, overlay);
}

/** When a closure holds, in words: "closed throughout", "closed from 3 h", "closed until 1 h". */
export function closureText(c: { fromMinutes: number; untilMinutes: number | null }): string {
  if (c.fromMinutes === 0 && c.untilMinutes === null) return 'closed throughout';
  if (c.untilMinutes === null) return `closed from ${formatDuration(c.fromMinutes)} after the order`;
  if (c.fromMinutes === 0) return `closed until ${formatDuration(c.untilMinutes)} after the order`;
  return `closed ${formatDuration(c.fromMinutes)}–${formatDuration(c.untilMinutes)} after the order`;
}

const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;

/** The overlay in one line, for the list of scenarios. */
export function overlaySummary(overlay: ScenarioOverlay): string {
  const parts = [
    overlay.closures.length ? plural(overlay.closures.length, 'road closed', 'roads closed') : '',
    overlay.laneChanges.length ? plural(overlay.laneChanges.length, 'lane change', 'lane changes') : '',
    overlay.contraflow.length ? plural(overlay.contraflow.length, 'contraflow corridor', 'contraflow corridors') : '',
    overlay.classFactors.length ? plural(overlay.classFactors.length, 'class factor', 'class factors') : '',
    overlay.removedShelterIds.length ? plural(overlay.removedShelterIds.length, 'shelter taken out', 'shelters taken out') : '',
    overlay.addedShelters.length ? plural(overlay.addedShelters.length, 'shelter added', 'shelters added') : '',
    overlay.departureDelays.length ? plural(overlay.departureDelays.length, 'zone delayed', 'zones delayed') : '',
    overlay.departureSchedules.length ? plural(overlay.departureSchedules.length, 'zone on a departure schedule', 'zones on a departure schedule') : '',
  ].filter(Boolean);
  return parts.length ? parts.join(', ') : 'No changes to the base plan yet';
}
