// The map with the choke points, the choke-point table, what holds arrivals down and the
// ranking of fixes.
import type { Content, TableCell } from 'pdfmake/interfaces';
import type { BriefingInput } from '../briefing-input';
import { arrivalLimitParts, arrivalLimitSummary } from '../../../../shared/model/arrival-limits';
import { formatCount, formatDuration, formatShare } from '../../../../shared/format/numbers';
import { mapSvg } from '../map-svg';
import { chokePointRanks, rankedChokePoints, rankFixes, shareOfLimit } from '../rankings';
import { roadNamer } from '../road-labels';
import { dataTable, td, th } from './document-styles';
import { CHOKE_POINT_COLOUR } from '../../../../shared/format/colours';

function windows(w: [number, number][]): string {
  if (w.length === 0) return '—';
  const shown = w.slice(0, 3).map(([a, b]) => `${formatCount(a)}–${formatCount(b)}`);
  return `${shown.join(', ')}${w.length > 3 ? ` (+${w.length - 3} more)` : ''} min`;
}

function roadClassWords(c: string): string {
  return c.replace(/_/g, ' ');
}

export function mapFigure(input: BriefingInput): Content[] {
  return [
    { text: 'Where the roads choke', style: 'h1' },
    {
      text: 'The violet roads are the choke points: they set the limit on evacuees per hour and together form the narrowest cross-section between the zones and the shelters or exits. Numbers match the table below.',
      style: 'note',
      margin: [0, 0, 0, 6],
    },
    { svg: mapSvg({ ...input.map, chokePoints: chokePointRanks(input.result), unitSystem: input.unitSystem, width: 516, height: 350 }), width: 516 },
    { text: 'Figure 2. Road network, evacuation zones and shelters; north is up. Drawn from the run’s stored geometry.', style: 'caption' },
  ];
}

export function chokePointTable(input: BriefingInput): Content[] {
  const roads = roadNamer(input.map);
  const ranked = rankedChokePoints(input.result);
  if (ranked.length === 0) {
    return [{ text: 'Choke points', style: 'h2' }, { text: 'This run reported no choke points.', style: 'note' }];
  }
  const rows: TableCell[][] = ranked.map((b, i) => [
    td(String(i + 1), { bold: true, color: CHOKE_POINT_COLOUR }),
    td(roads.name(b)),
    td(roads.direction(b)),
    td(roadClassWords(b.roadClass)),
    td(formatCount(b.capacityVehiclesPerHour), { right: true }),
    td(formatShare(shareOfLimit(input.result, b)), { right: true }),
    td(b.inStaticCut ? 'yes' : 'no'),
    td(windows(b.cutWindows)),
    td(formatCount(b.gainPerExtraLaneVehiclesPerHour), { right: true }),
  ]);
  return [
    { text: 'Choke points', style: 'h2', margin: [0, 14, 0, 4] },
    dataTable(
      [12, '*', 70, 52, 46, 40, 34, 76, 42],
      [th('#'), th('Road'), th('Direction'), th('Class'), th('Capacity\nveh/h', 'right'), th('Share of\nlimit', 'right'), th('Steady\nlimit'), th('Limiting\nduring'), th('+1 lane\nveh/h', 'right')],
      rows,
    ),
    {
      text: '“Share of limit” is the road’s part of the narrowest cross-section: of the time-by-time analysis where the road is part of it, else of the steady state. “Limiting during” gives the minutes after the order when the road is full in the time-by-time analysis. “+1 lane” is the gain in evacuees per hour from one more lane on that road alone.',
      style: 'note',
      margin: [0, 4, 0, 0],
    },
  ];
}

/** The time-expanded cut by what it is made of; results stored before it was reported have none. */
export function arrivalLimitsTable(input: BriefingInput): Content[] {
  const limits = input.result.arrivalLimits;
  if (!limits) return [];
  const rows: TableCell[][] = arrivalLimitParts(limits).map((p) => [td(`${p.label} (${p.detail})`), td(formatCount(p.vehicles), { right: true }), td(formatShare(p.share), { right: true })]);
  return [
    { text: 'What holds arrivals down', style: 'h2', margin: [0, 14, 0, 4] },
    { text: arrivalLimitSummary(limits, { count: formatCount, share: formatShare, duration: formatDuration }), margin: [0, 0, 0, 4] },
    ...(rows.length ? [dataTable(['*', 70, 50], [th('Part of the limit'), th('Vehicles', 'right'), th('Share', 'right')], rows)] : []),
    {
      text: 'The narrowest cross-section of the time-by-time analysis at that moment: its size is the most that can have arrived by then (max-flow/min-cut), and raising anything that is not part of it cannot raise that number.',
      style: 'note',
      margin: [0, 4, 0, 0],
    },
  ];
}

export function fixRanking(input: BriefingInput): Content[] {
  const roads = roadNamer(input.map);
  const fixes = rankFixes(input.result);
  const ppv = input.assumptions.personsPerVehicle;
  const heading: Content = { text: 'Most valuable fixes', style: 'h2', margin: [0, 14, 0, 4] };
  if (fixes.length === 0) return [heading, { text: 'No single change tested in this run raises evacuees per hour.', style: 'note' }];
  const rows: TableCell[][] = fixes.map((f, i) => [
    td(String(i + 1), { bold: true }),
    td(f.kind === 'add-lane' ? 'Add a lane' : 'Reopen the road'),
    td(roads.name(f)),
    td(roads.direction(f)),
    td(`+${formatCount(f.gainVehiclesPerHour)}`, { right: true }),
    td(`+${formatCount(f.gainVehiclesPerHour * ppv)}`, { right: true }),
  ]);
  return [
    heading,
    dataTable([12, 78, '*', 76, 58, 62], [th('#'), th('Change'), th('Road'), th('Direction'), th('Gain\nveh/h', 'right'), th('Gain\npersons/h', 'right')], rows),
    {
      text: 'Each gain is for that change alone, measured against this run; gains do not add up, because once one road is widened another may set the limit. Any change to lanes, signals or closures needs a licensed traffic engineer’s review.',
      style: 'note',
      margin: [0, 4, 0, 0],
    },
  ];
}
