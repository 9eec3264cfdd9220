// The zone-routes CSV: the caution and identity as leading comment lines, then one row per zone
// and road, with no cell a spreadsheet would run as a formula. Parsed back with papaparse (an
// outside CSV reader) taking '#' lines as comments.
import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { CAUTION_LINE } from '../../../shared/api/caution';
import { zoneRoutesCsv, zoneRoutesCsvHeader } from '../../../shared/model/zone-routes-csv';

describe('zone routes CSV', () => {
  const answer = {
    kind: 'zone-routes' as const,
    clearanceMinutes: 125,
    zones: [
      {
        zoneId: 7,
        name: '=Mill Quarter',
        vehicles: 300,
        deliveredVehicles: 300,
        shelters: [{ shelterId: 3, name: 'Hill School', vehicles: 300 }],
        mainRoads: [{ segmentId: 41, direction: 'forward' as const, name: 'Quay Lane', roadClass: 'secondary', vehicles: 300 }],
        roads: [
          { segmentId: 41, direction: 'forward' as const, name: 'Quay Lane', roadClass: 'secondary', vehicles: 300 },
          { segmentId: 42, direction: 'backward' as const, name: 'Back, Row', roadClass: 'residential', vehicles: 20 },
        ],
        departureWindowMinutes: [0, 45] as [number, number],
        arrivalWindowMinutes: [5, 60] as [number, number],
      },
      { zoneId: 8, name: 'Empty', vehicles: 0, deliveredVehicles: 0, shelters: [], mainRoads: [], roads: [], departureWindowMinutes: null, arrivalWindowMinutes: null },
    ],
  };
  const identity = {
    contents: 'Search: where each zone goes',
    planId: 'plan-1',
    planName: 'Larkmoor',
    dataVersion: 4,
    exportedAt: '2026-12-05T15:00:00.000Z',
    run: null,
    notes: ['search p-1'],
  };

  it('leads with the caution and identity as comments, then one row per zone and road, formula cells guarded', () => {
    const csv = zoneRoutesCsv(answer, identity);
    const comments = csv.split('\r\n').filter((l) => l.startsWith('# '));
    expect(comments[0]).toBe(`# caution: ${CAUTION_LINE}`);
    expect(comments).toContain('# plan_id: plan-1');
    expect(comments).toContain('# note_1: search p-1');
    const rows = Papa.parse<string[]>(csv, { skipEmptyLines: true, delimiter: ',', comments: '#' }).data;
    expect(rows[0]).toEqual(zoneRoutesCsvHeader);
    expect(rows.slice(1)).toEqual([
      // OWASP "CSV Injection": a text cell starting with = is written with a leading apostrophe.
      ['7', "'=Mill Quarter", '300', '300', 'Hill School (300)', '0', '45', '5', '60', '41', 'forward', 'Quay Lane', 'secondary', '300', 'true'],
      ['7', "'=Mill Quarter", '300', '300', 'Hill School (300)', '0', '45', '5', '60', '42', 'backward', 'Back, Row', 'residential', '20', 'false'],
      ['8', 'Empty', '0', '0', '', '', '', '', '', '', '', '', '', '', ''],
    ]);
  });
});
