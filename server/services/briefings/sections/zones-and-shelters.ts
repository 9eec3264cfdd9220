// Per-zone and per-shelter tables, with totals.
import type { Content, TableCell } from 'pdfmake/interfaces';
import type { BriefingInput } from '../briefing-input';
import { formatCount, formatDuration, formatShare, formatSpan } from '../../../../shared/format/numbers';
import { COLOURS, dataTable, td, th } from './document-styles';

export function zoneTable(input: BriefingInput): Content[] {
  const h = input.result.headline;
  const zones = input.result.zones;
  const rows: TableCell[][] = zones.map((z) => [
    td(z.name),
    td(formatCount(z.demandPersons), { right: true }),
    td(formatCount(z.demandVehicles), { right: true }),
    td(formatCount(z.deliveredVehicles), { right: true }),
    td(z.demandVehicles > 0 ? formatShare(z.deliveredVehicles / z.demandVehicles) : '—', { right: true }),
    td(formatCount(z.steadyStateVehiclesPerHour), { right: true }),
    td(z.clearanceMinutes === null ? 'not cleared' : formatDuration(z.clearanceMinutes), {
      right: true,
      color: z.clearanceMinutes === null ? COLOURS.warn : COLOURS.ink,
    }),
  ]);
  rows.push([
    td('All zones', { bold: true }),
    td(formatCount(h.demandPersons), { right: true, bold: true }),
    td(formatCount(h.demandVehicles), { right: true, bold: true }),
    td(formatCount(h.deliveredVehicles), { right: true, bold: true }),
    td(h.demandVehicles > 0 ? formatShare(h.deliveredVehicles / h.demandVehicles) : '—', { right: true, bold: true }),
    td(formatCount(h.steadyStateVehiclesPerHour), { right: true, bold: true }),
    td(h.clearanceMinutes === null ? 'not cleared' : formatDuration(h.clearanceMinutes), { right: true, bold: true }),
  ]);
  return [
    { text: 'Evacuation zones', style: 'h1', margin: [0, 20, 0, 6] },
    dataTable(
      ['*', 56, 50, 56, 44, 60, 66],
      [th('Zone'), th('Persons\nleaving', 'right'), th('Vehicles\nleaving', 'right'), th('Vehicles\narrived', 'right'), th('Share', 'right'), th('Steady rate\nveh/h', 'right'), th('Zone\nclear', 'right')],
      rows,
    ),
    {
      text: `“Vehicles arrived” counts vehicles from the zone at a shelter or exit within the horizon of ${formatSpan(h.horizonMinutes)}. “Zone clear” is when its last vehicle arrives; “not cleared” means some are still on the way when the horizon ends.`,
      style: 'note',
      margin: [0, 4, 0, 0],
    },
  ];
}

export function shelterTable(input: BriefingInput): Content[] {
  const shelters = input.result.shelters;
  const rows: TableCell[][] = shelters.map((s) => {
    const use = s.capacityPersons ? s.arrivedPersons / s.capacityPersons : null;
    return [
      td(s.name),
      td(s.capacityPersons === null ? 'not stated' : formatCount(s.capacityPersons), { right: true }),
      td(formatCount(s.arrivedPersons), { right: true }),
      td(formatCount(s.arrivedVehicles), { right: true }),
      td(use === null ? '—' : formatShare(use), { right: true, color: use !== null && use > 1 ? COLOURS.warn : COLOURS.ink, bold: use !== null && use > 1 }),
      td(formatCount(s.steadyStateVehiclesPerHour), { right: true }),
    ];
  });
  const sum = (f: (s: (typeof shelters)[number]) => number) => shelters.reduce((t, s) => t + f(s), 0);
  rows.push([
    td('All shelters and exits', { bold: true }),
    td(shelters.every((s) => s.capacityPersons !== null) ? formatCount(sum((s) => s.capacityPersons ?? 0)) : '—', { right: true, bold: true }),
    td(formatCount(sum((s) => s.arrivedPersons)), { right: true, bold: true }),
    td(formatCount(sum((s) => s.arrivedVehicles)), { right: true, bold: true }),
    td('', { right: true }),
    td(formatCount(sum((s) => s.steadyStateVehiclesPerHour)), { right: true, bold: true }),
  ]);
  return [
    { text: 'Shelters and exits', style: 'h1', margin: [0, 18, 0, 6] },
    dataTable(['*', 70, 70, 70, 56, 70], [th('Shelter or exit'), th('Capacity\n(persons)', 'right'), th('Arrived\n(persons)', 'right'), th('Arrived\n(vehicles)', 'right'), th('Space\nused', 'right'), th('Steady rate\nveh/h', 'right')], rows),
    { text: 'A shelter over 100 % of its stated capacity would need overflow space; where no capacity is stated, intake was not limited in the run.', style: 'note', margin: [0, 4, 0, 0] },
  ];
}
