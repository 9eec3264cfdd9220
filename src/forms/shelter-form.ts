// The shelter form: a name and how many persons it takes (empty = an exit without a limit,
// e.g. where a road leaves the study area), validated with the server's shelterCreateSchema.
import { shelterCreateSchema, type Shelter, type ShelterCreate } from '@shared/api/zones-shelters';
import { optionalNumberFrom, parseForm, type FieldErrors } from './zod-errors';

export type ShelterFormValues = { name: string; capacityPersons: string | number | null; unbounded: boolean };

export const newShelterValues = (index: number): ShelterFormValues => ({ name: `Shelter ${index}`, capacityPersons: '', unbounded: false });

export const shelterValues = (shelter: Shelter): ShelterFormValues => ({
  name: shelter.name,
  capacityPersons: shelter.capacityPersons,
  unbounded: shelter.capacityPersons === null,
});

export function validateShelter(
  values: ShelterFormValues,
  position: { lon: number; lat: number },
): { ok: true; value: ShelterCreate } | { ok: false; errors: FieldErrors } {
  const capacity = values.unbounded ? null : optionalNumberFrom(values.capacityPersons);
  if (!values.unbounded && capacity === null) return { ok: false, errors: { capacityPersons: 'Enter how many persons it takes, or mark it as an exit.' } };
  return parseForm(shelterCreateSchema, { name: values.name.trim(), capacityPersons: capacity, lon: position.lon, lat: position.lat });
}
