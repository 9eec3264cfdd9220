// The editor's overlay edits: each tool's change is pure (the old overlay is untouched), toggles
// undo themselves, and the shared schema catches what the server would refuse.
import { describe, expect, it } from 'vitest';
import {
  addShelter,
  closureText,
  emptyOverlay,
  nextCorridorName,
  overlaySummary,
  removeAddedShelter,
  setClassFactor,
  setClosureTimes,
  setCorridorDirection,
  setDepartureDelay,
  setLaneChange,
  toggleClosure,
  toggleCorridorSegment,
  toggleRemovedShelter,
  validateOverlay,
} from '../../src/forms/scenario-overlay';
import { changesBySegment, dominantChange } from '../../src/map/scenario-style';

describe('closures', () => {
  it('closes a road from the start and reopens it on a second toggle, leaving the input alone', () => {
    const before = emptyOverlay();
    const closed = toggleClosure(before, 7);
    expect(closed.closures).toEqual([{ segmentId: 7, fromMinutes: 0, untilMinutes: null }]);
    expect(before.closures).toEqual([]);
    expect(toggleClosure(closed, 7).closures).toEqual([]);
  });

  it('keeps the times of a closure and says them in words', () => {
    const o = setClosureTimes(toggleClosure(emptyOverlay(), 7), 7, 180, null);
    expect(o.closures[0]).toEqual({ segmentId: 7, fromMinutes: 180, untilMinutes: null });
    expect(closureText(o.closures[0]!)).toBe('closed from 3 h after the order');
    expect(closureText({ fromMinutes: 0, untilMinutes: 60 })).toBe('closed until 1 h after the order');
    expect(closureText({ fromMinutes: 0, untilMinutes: null })).toBe('closed throughout');
    expect(closureText({ fromMinutes: 30, untilMinutes: 90 })).toBe('closed 30 min–1 h 30 min after the order');
  });

  it('refuses a closure that ends before it starts, and a time that is not a number', () => {
    const o = setClosureTimes(toggleClosure(emptyOverlay(), 7), 7, 120, 60);
    const checked = validateOverlay(o);
    expect(checked.ok).toBe(false);
    if (!checked.ok) expect(checked.errors['closures.0.untilMinutes']).toBe('A closure must end after it starts.');
    const nan = validateOverlay(setClosureTimes(toggleClosure(emptyOverlay(), 7), 7, Number.NaN, null));
    expect(nan.ok).toBe(false);
    if (!nan.ok) expect(nan.errors['closures.0.fromMinutes']).toBe('Enter a number.');
  });
});

describe('lanes, corridors, factors, shelters, departures', () => {
  it('drops empty lane fields and removes a change with nothing left', () => {
    const o = setLaneChange(emptyOverlay(), 3, { lanesForward: 3, lanesBackward: undefined, speedKmh: undefined });
    expect(o.laneChanges).toEqual([{ segmentId: 3, patch: { lanesForward: 3 } }]);
    expect(setLaneChange(o, 3, {}).laneChanges).toEqual([]);
  });

  it('builds a corridor road by road, takes a road out again, and drops an empty corridor', () => {
    const name = nextCorridorName(emptyOverlay());
    expect(name).toBe('Corridor 1');
    let o = toggleCorridorSegment(emptyOverlay(), name, 4, 'forward');
    o = toggleCorridorSegment(o, name, 5, 'backward');
    expect(o.contraflow).toEqual([{ name, segmentIds: [4, 5], direction: 'forward' }]);
    expect(nextCorridorName(o)).toBe('Corridor 2');
    o = setCorridorDirection(o, name, 'backward');
    expect(o.contraflow[0]!.direction).toBe('backward');
    o = toggleCorridorSegment(toggleCorridorSegment(o, name, 4, 'forward'), name, 5, 'forward');
    expect(o.contraflow).toEqual([]);
  });

  it('treats a factor of 1 and a delay of 0 as no change', () => {
    let o = setClassFactor(emptyOverlay(), 'residential', 0.85);
    expect(o.classFactors).toEqual([{ roadClass: 'residential', factor: 0.85 }]);
    o = setClassFactor(o, 'residential', 1);
    expect(o.classFactors).toEqual([]);
    o = setDepartureDelay(emptyOverlay(), 2, 30);
    expect(o.departureDelays).toEqual([{ zoneId: 2, delayMinutes: 30 }]);
    expect(setDepartureDelay(o, 2, 0).departureDelays).toEqual([]);
  });

  it('takes a plan shelter out and back, and adds and removes scenario shelters', () => {
    let o = toggleRemovedShelter(emptyOverlay(), 9);
    expect(o.removedShelterIds).toEqual([9]);
    expect(toggleRemovedShelter(o, 9).removedShelterIds).toEqual([]);
    o = addShelter(o, { name: 'School gym', capacityPersons: 400, lon: 1, lat: 2 });
    o = addShelter(o, { name: 'Edge exit', capacityPersons: null, lon: 3, lat: 4 });
    expect(removeAddedShelter(o, 0).addedShelters.map((s) => s.name)).toEqual(['Edge exit']);
    expect(validateOverlay(o).ok).toBe(true);
    const unnamed = validateOverlay(addShelter(emptyOverlay(), { name: '', capacityPersons: 10, lon: 0, lat: 0 }));
    expect(unnamed.ok).toBe(false);
    if (!unnamed.ok) expect(Object.keys(unnamed.errors)).toContain('addedShelters.0.name');
  });
});

describe('the overlay on the map and in words', () => {
  it('lists every change per road, and a closure outranks the others', () => {
    let o = toggleClosure(emptyOverlay(), 1);
    o = setLaneChange(o, 1, { lanesForward: 2 });
    o = toggleCorridorSegment(o, 'Corridor 1', 2, 'forward');
    o = setLaneChange(o, 2, { lanesBackward: 1 });
    const changes = changesBySegment(o);
    expect(changes.get(1)).toEqual(['closed', 'lanes']);
    expect(changes.get(2)).toEqual(['lanes', 'corridor']);
    expect(dominantChange(changes.get(1)!)).toBe('closed');
    expect(dominantChange(changes.get(2)!)).toBe('corridor');
    expect(dominantChange(['lanes'])).toBe('lanes');
  });

  it('sums the overlay up in one line', () => {
    expect(overlaySummary(emptyOverlay())).toBe('No changes to the base plan yet');
    const o = setDepartureDelay(toggleClosure(toggleClosure(emptyOverlay(), 1), 2), 5, 20);
    expect(overlaySummary(o)).toBe('2 roads closed, 1 zone delayed');
  });
});
