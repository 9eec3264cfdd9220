// Zone and shelter forms: percent in the form, share in the contract; errors under the form's
// own fields; the vehicle estimate agrees with the model's count (shared/model/vehicles).
import { describe, expect, it } from 'vitest';
import type { ZoneGeometry } from '../../shared/api/zones-shelters';
import { ZONE_DEFAULTS } from '../../shared/model/zone-defaults';
import { zoneVehicles } from '../../shared/model/vehicles';
import { newZoneValues, previewCurve, validateZone, zoneValues, zoneVehicleEstimate } from '../../src/forms/zone-form';
import { newShelterValues, validateShelter } from '../../src/forms/shelter-form';

const square: ZoneGeometry = {
  type: 'Polygon',
  coordinates: [
    [
      [-30, 45],
      [-29.99, 45],
      [-29.99, 45.01],
      [-30, 45.01],
      [-30, 45],
    ],
  ],
};

describe('zone form', () => {
  it('starts from the model defaults and needs the residents', () => {
    const values = newZoneValues(3);
    expect(values.name).toBe('Zone 3');
    expect(values.participationPercent).toBe(ZONE_DEFAULTS.participationRate * 100);
    expect(values.curveKind).toBe(ZONE_DEFAULTS.departureCurve.kind);
    const result = validateZone(values, square);
    expect(result.ok ? '' : result.errors.population).toBe('Enter a number.');
  });

  it('turns the form into a ZoneCreate: percent to share, curve by kind', () => {
    const values = { ...newZoneValues(1), population: '4200', participationPercent: '72.5', personsPerVehicle: '2.4', curveKind: 'uniform' as const, durationHours: '3' };
    const result = validateZone(values, square);
    expect(result).toEqual({
      ok: true,
      value: { name: 'Zone 1', population: 4200, participationRate: 0.725, personsPerVehicle: 2.4, departureCurve: { kind: 'uniform', durationHours: 3 }, geometry: square },
    });
  });

  it('shows curve errors under the curve fields and participation under the percent field', () => {
    const values = { ...newZoneValues(1), population: '100', participationPercent: '140', curveKind: 'rayleigh' as const, sigmaHours: '0' };
    const result = validateZone(values, square);
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.errors.participationPercent).toBeDefined();
    expect(result.errors.sigmaHours).toBeDefined();
  });

  it('refuses an open ring, as the server does', () => {
    const open: ZoneGeometry = { type: 'Polygon', coordinates: [[[-30, 45], [-29.99, 45], [-29.99, 45.01], [-30, 45.01]]] };
    const result = validateZone({ ...newZoneValues(1), population: '10' }, open);
    expect(result.ok).toBe(false);
  });

  it('round-trips a stored zone', () => {
    const zone = { id: 4, name: 'Old Town', population: 5400, participationRate: 0.85, personsPerVehicle: 2.2, departureCurve: { kind: 'logistic' as const, responseRatePerHour: 1.5, halfLoadingHours: 2 }, geometry: square };
    const { id: _id, ...stored } = zone;
    expect(validateZone(zoneValues(zone), square)).toEqual({ ok: true, value: stored });
  });

  it('estimates vehicles the way the model counts them', () => {
    for (const [population, percent, perVehicle] of [[5400, 85, 2.2], [3200, 80, 2], [1, 100, 3]] as const) {
      const estimate = zoneVehicleEstimate({ ...newZoneValues(1), population, participationPercent: percent, personsPerVehicle: perVehicle });
      expect(estimate).toBe(zoneVehicles({ population, participationRate: percent / 100, personsPerVehicle: perVehicle }));
    }
  });

  it('previews only a valid curve', () => {
    expect(previewCurve({ ...newZoneValues(1), curveKind: 'logistic' })).toEqual(ZONE_DEFAULTS.departureCurve);
    expect(previewCurve({ ...newZoneValues(1), curveKind: 'uniform', durationHours: '' })).toBeNull();
  });
});

describe('shelter form', () => {
  it('needs a capacity unless it is an exit', () => {
    const at = { lon: -29.9, lat: 45.1 };
    expect(validateShelter(newShelterValues(1), at)).toEqual({ ok: false, errors: { capacityPersons: 'Enter how many persons it takes, or mark it as an exit.' } });
    expect(validateShelter({ ...newShelterValues(1), unbounded: true }, at)).toEqual({ ok: true, value: { name: 'Shelter 1', capacityPersons: null, lon: -29.9, lat: 45.1 } });
    expect(validateShelter({ ...newShelterValues(2), capacityPersons: '1200' }, at)).toEqual({ ok: true, value: { name: 'Shelter 2', capacityPersons: 1200, lon: -29.9, lat: 45.1 } });
    const result = validateShelter({ name: ' ', capacityPersons: '12.5', unbounded: false }, at);
    expect(result.ok ? {} : result.errors).toMatchObject({ name: expect.any(String), capacityPersons: 'Enter a whole number.' });
  });
});
