// Persons ↔ vehicles. The engine counts vehicles; briefings report persons.
import type { ZoneAttributes } from '../api/zone-shelter-attributes';

// Products like 100 × 0.7 come out as 70.00000000000001 in binary floating point; without
// this slack, rounding up would add a phantom vehicle.
const ROUNDING_SLACK = 1e-9;

/** Residents who leave: population × participation rate, persons (not rounded). */
export function evacuatingPersons(zone: Pick<ZoneAttributes, 'population' | 'participationRate'>): number {
  return zone.population * zone.participationRate;
}

/**
 * Vehicles a zone sends: ⌈population × participation rate / persons per vehicle⌉. Rounded up
 * so that every evacuating person has a seat (the conservative side for clearance time).
 */
export function zoneVehicles(zone: Pick<ZoneAttributes, 'population' | 'participationRate' | 'personsPerVehicle'>): number {
  return Math.ceil(evacuatingPersons(zone) / zone.personsPerVehicle - ROUNDING_SLACK);
}

/**
 * Persons per vehicle arriving at shelters: all evacuating persons over all vehicles (the
 * vehicle-weighted mean of the zones' figures), 1 if nobody leaves.
 */
export function meanPersonsPerVehicle(zones: readonly Pick<ZoneAttributes, 'population' | 'participationRate' | 'personsPerVehicle'>[]): number {
  let persons = 0;
  let vehicles = 0;
  for (const z of zones) {
    persons += evacuatingPersons(z);
    vehicles += evacuatingPersons(z) / z.personsPerVehicle;
  }
  return vehicles > 0 ? persons / vehicles : 1;
}

/**
 * Vehicles a shelter takes: ⌊capacity in persons / persons per vehicle⌋, rounded down so
 * that a shelter is never credited with more people than it holds; null stays unbounded.
 */
export function shelterVehicles(capacityPersons: number | null, personsPerVehicle: number): number | null {
  if (capacityPersons === null) return null;
  return Math.floor(capacityPersons / personsPerVehicle + ROUNDING_SLACK);
}
