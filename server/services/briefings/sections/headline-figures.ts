// The headline figures as a row of panels, then the evacuation curve beneath them.
import type { Content, TableCell } from 'pdfmake/interfaces';
import type { BriefingInput } from '../briefing-input';
import { curveSvg } from '../curve-svg';
import { formatCount, formatDuration, formatPercent, formatSpan } from '../format';
import { COLOURS } from './document-styles';

function panel(label: string, value: string, notes: string[]): TableCell {
  return {
    stack: [
      { text: label.toUpperCase(), style: 'figureLabel' },
      { text: value, style: 'figureValue', margin: [0, 4, 0, 3] },
      ...notes.map((t) => ({ text: t, style: 'figureNote' })),
    ],
    fillColor: COLOURS.band,
    margin: [8, 7, 8, 8],
  };
}

function timePanel(label: string, minutes: number | null, horizonMinutes: number, note: string): TableCell {
  if (minutes === null) return panel(label, 'Not reached', [`Not within the ${formatSpan(horizonMinutes)} studied.`, note]);
  return panel(label, formatDuration(minutes), [`${formatCount(minutes)} minutes after the order.`, note]);
}

export function headlineFigures(input: BriefingInput): Content[] {
  const h = input.result.headline;
  const delivered = h.demandPersons > 0 ? formatPercent(h.deliveredPersons / h.demandPersons) : '—';
  const row1: TableCell[] = [
    panel('Evacuees per hour', `${formatCount(h.steadyStatePersonsPerHour)} persons/h`, [
      `${formatCount(h.steadyStateVehiclesPerHour)} vehicles per hour at steady state:`,
      'the most the roads carry once traffic flows (an upper bound).',
    ]),
    panel('Evacuated within the horizon', `${formatCount(h.deliveredPersons)} persons`, [
      `of ${formatCount(h.demandPersons)} expected to leave (${delivered});`,
      `${formatCount(h.deliveredVehicles)} of ${formatCount(h.demandVehicles)} vehicles within ${formatSpan(h.horizonMinutes)}.`,
    ]),
    panel('Clearance time', h.clearanceMinutes === null ? 'Not reached' : formatDuration(h.clearanceMinutes), [
      h.clearanceMinutes === null
        ? `Some evacuees are still on the way at the end of the ${formatSpan(h.horizonMinutes)} studied.`
        : `${formatCount(h.clearanceMinutes)} minutes from the order until the last vehicle is at a shelter.`,
    ]),
  ];
  const row2: TableCell[] = [
    timePanel('50 % at a shelter', h.p50Minutes, h.horizonMinutes, 'Half of those leaving have arrived.'),
    timePanel('90 % at a shelter', h.p90Minutes, h.horizonMinutes, 'Evacuation time estimates are often given at this share.'),
    timePanel('95 % at a shelter', h.p95Minutes, h.horizonMinutes, 'All but the last one in twenty.'),
  ];
  const gap = { hLineWidth: () => 0, vLineWidth: () => 0, paddingLeft: (i: number) => (i === 0 ? 0 : 4), paddingRight: (i: number) => (i === 2 ? 0 : 4), paddingTop: () => 4, paddingBottom: () => 4 };
  const ppv = h.demandVehicles > 0 ? h.demandPersons / h.demandVehicles : input.assumptions.personsPerVehicle;
  return [
    { text: 'Headline figures', style: 'h1' },
    { table: { widths: ['*', '*', '*'], body: [row1, row2] }, layout: gap },
    {
      text: 'Times are counted from the evacuation order and include waiting to leave (the departure curve), travel and queues. Persons are vehicles times the persons per vehicle stated under Assumptions.',
      style: 'note',
      margin: [0, 4, 0, 0],
    },
    { text: 'Evacuation curve', style: 'h2', margin: [0, 16, 0, 2] },
    { text: 'How many have reached a shelter by each minute, at the best routing the network allows.', style: 'note', margin: [0, 0, 0, 6] },
    {
      svg: curveSvg({
        stepMinutes: input.result.curve.stepMinutes,
        deliveredVehicles: input.result.curve.deliveredVehicles,
        demandVehicles: h.demandVehicles,
        horizonMinutes: h.horizonMinutes,
        p50Minutes: h.p50Minutes,
        p90Minutes: h.p90Minutes,
        p95Minutes: h.p95Minutes,
        clearanceMinutes: h.clearanceMinutes,
        personsPerVehicle: ppv,
      }),
      width: 516,
    },
    {
      text:
        'Figure 1. Cumulative vehicles at shelters (left axis) and persons (right axis). The dashed line is the number to move. ' +
        'The curve comes from a time-expanded network: by each minute, no routing of the same traffic gets more vehicles to the shelters.',
      style: 'caption',
    },
  ];
}
