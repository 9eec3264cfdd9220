// Editing a road class's defaults: units follow the organisation, a value left as shown stays
// exactly as stored, and a changed value is refused until its source changes too.
import { afterEach, describe, expect, it } from 'vitest';
import { speedToKmh } from '../../shared/format/units';
import { defaultCapacityTable } from '../../shared/model/capacity-defaults';
import { capacityRowForm, validateCapacityRowEdit } from '../../src/forms/capacity-row-edit';
import { setPreferences } from '../../src/format/preferences';

afterEach(() => setPreferences({ unitSystem: 'metric', timeZone: null }));

const table = defaultCapacityTable();
const secondary = table.rows.find((r) => r.roadClass === 'secondary')!;

describe('a capacity row edit', () => {
  it('says nothing changed for an untouched form, in either unit system', () => {
    expect(validateCapacityRowEdit(table, 'secondary', capacityRowForm(secondary))).toEqual({ ok: false, errors: { form: 'Nothing changed.' } });
    setPreferences({ unitSystem: 'us-customary', timeZone: null });
    // 50 km/h shows as 31.07 mph and 118.06 veh/km as 190 veh/mi (HCM 6th ed. Exhibit 25-2); left so, they stay as stored.
    const form = capacityRowForm(secondary);
    expect(form.speed).toBe(31.07);
    expect(form.jamDensity).toBe(190);
    expect(validateCapacityRowEdit(table, 'secondary', form)).toEqual({ ok: false, errors: { form: 'Nothing changed.' } });
  });

  it('asks for the source of a changed value', () => {
    const form = { ...capacityRowForm(secondary), capacityVehPerHourPerLane: '700' };
    expect(validateCapacityRowEdit(table, 'secondary', form)).toEqual({ ok: false, errors: { capacitySource: 'The value changed: say where the new one comes from.' } });
  });

  it('takes mph and stores km/h that read back as the mph entered', () => {
    setPreferences({ unitSystem: 'us-customary', timeZone: null });
    const form = { ...capacityRowForm(secondary), speed: '35', speedSource: 'posted limit 35 mph' };
    const checked = validateCapacityRowEdit(table, 'secondary', form);
    expect(checked.ok).toBe(true);
    const row = checked.ok ? checked.table.rows.find((r) => r.roadClass === 'secondary')! : null;
    expect(row?.speedKmh).toBe(speedToKmh(35, 'us-customary'));
    expect(capacityRowForm(row!).speed).toBe(35);
  });

  it('words bad values and empty sources plainly', () => {
    const form = { ...capacityRowForm(secondary), lanesPerDirection: 'two', capacitySource: ' ' };
    const checked = validateCapacityRowEdit(table, 'secondary', form);
    expect(checked.ok ? {} : checked.errors).toMatchObject({ lanesPerDirection: 'Enter a number.', capacitySource: 'Say where this value comes from.' });
  });
});
