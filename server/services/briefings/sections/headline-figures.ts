// The headline figures as a row of panels, then the evacuation curve beneath them.
import type { Content, TableCell } from 'pdfmake/interfaces';
import type { BriefingInput } from '../briefing-input';
import { curveSvg } from '../curve-svg';
import { headlineFigures as figuresInWords } from '../../../../shared/format/headline';
import { tripTimesWarning } from '../../../../shared/format/trip-times';
import { COLOURS } from './document-styles';

function panel(label: string, value: string, notes: string[]): TableCell {
  return {
    stack: [
      { text: label, style: 'figureLabel' },
      { text: value, style: 'figureValue', margin: [0, 4, 0, 3] },
      ...notes.map((t) => ({ text: t, style: 'figureNote' })),
    ],
    fillColor: COLOURS.band,
    margin: [8, 7, 8, 8],
  };
}

export function headlineFigures(input: BriefingInput): Content[] {
  const h = input.result.headline;
  // The same labels, values and notes as the workspace's tiles (shared/format/headline.ts).
  const figures = figuresInWords(input.result).map((f) => panel(f.label, f.value, f.notes));
  const row1: TableCell[] = figures.slice(0, 3);
  const row2: TableCell[] = figures.slice(3, 6);
  const gap = { hLineWidth: () => 0, vLineWidth: () => 0, paddingLeft: (i: number) => (i === 0 ? 0 : 4), paddingRight: (i: number) => (i === 2 ? 0 : 4), paddingTop: () => 4, paddingBottom: () => 4 };
  // Past one step off free flow the times below carry that error: said here, where they are read.
  const tripWarning = input.result.routeTiming ? tripTimesWarning(input.result.routeTiming) : null;
  const ppv = h.demandVehicles > 0 ? h.demandPersons / h.demandVehicles : input.assumptions.personsPerVehicle;
  return [
    { text: 'Headline figures', style: 'h1' },
    { table: { widths: ['*', '*', '*'], body: [row1, row2] }, layout: gap },
    {
      text: 'Times are counted from the evacuation order and include waiting to leave (the departure curve), travel and queues. Persons are vehicles times the persons per vehicle stated under Assumptions.',
      style: 'note',
      margin: [0, 4, 0, 0],
    },
    ...(tripWarning ? [{ text: tripWarning, fontSize: 8.5, color: COLOURS.warn, lineHeight: 1.3, margin: [0, 6, 0, 0] } as Content] : []),
    { text: 'Evacuation curve', style: 'h2', margin: [0, 16, 0, 2] },
    { text: 'How many have arrived at a shelter or exit by each minute, at the best routing the network allows.', style: 'note', margin: [0, 0, 0, 6] },
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
        'Figure 1. Cumulative vehicles arrived at shelters or exits (left axis) and persons (right axis). The dashed line is the number to move. ' +
        'The curve comes from a time-expanded network: by each minute, no routing of the same traffic gets more vehicles to the shelters and exits.',
      style: 'caption',
    },
  ];
}
