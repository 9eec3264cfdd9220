// "Searches for the best change": the answers of the searches run on exactly this run's problem,
// each with what it found, the figures behind it and the caution that an optimum is not a plan.
import type { Content, TableCell } from 'pdfmake/interfaces';
import { proposalCaution, proposalKindTitles, type ProposalResult } from '../../../../shared/api/proposals';
import type { BriefingInput } from '../briefing-input';
import { formatCount, formatDuration } from '../../../../shared/format/numbers';
import { dataTable, td, th } from './document-styles';
import { CAUTION_LINE } from '../../../../shared/api/caution';
import { releaseOrderSentence, releaseWindows, zoneRouteColour, zoneRouteLines } from '../../../../shared/format/search-answers';
import { zoneRoutesSvg } from '../zone-routes-svg';

const vph = (n: number) => `${formatCount(Math.round(n))} veh/h`;
const when = (m: number | null) => (m === null ? 'not within the horizon' : formatDuration(m));
const roadName = (name: string) => name || 'unnamed road';

function one(result: ProposalResult, input: BriefingInput, ownPage: boolean): Content[] {
  const a = result.answer;
  const out: Content[] = [{ text: proposalKindTitles[a.kind], style: 'h2' }];
  if (a.kind === 'contraflow') {
    out.push({
      text:
        `Running ${a.corridors.length} corridor${a.corridors.length === 1 ? '' : 's'} one way, outbound, raises the steady rate from ${vph(a.baseVehiclesPerHour)} to ${vph(a.achievedVehiclesPerHour)}; ` +
        (a.method === 'exact' ? 'no choice of one-way roads can carry more.' : `no choice can exceed ${vph(a.boundVehiclesPerHour)}.`) +
        (a.timeExpanded ? ` Clearance ${when(a.timeExpanded.baseClearanceMinutes)} today, ${when(a.timeExpanded.chosenClearanceMinutes)} with them (no choice clears before ${when(a.timeExpanded.boundClearanceMinutes)}).` : ''),
      style: 'lead',
    });
    const rows: TableCell[][] = a.corridors.map((c, i) => [td(String(i + 1)), td([...new Set(c.segments.map((s) => roadName(s.name)))].join(', ')), td(vph(c.gainVehiclesPerHour), { right: true })]);
    if (rows.length) out.push(dataTable([40, '*', 80], [th('Corridor'), th('Roads'), th('Gain', 'right')], rows));
  } else if (a.kind === 'closures') {
    out.push({ text: `Closing one road ${a.closeAtMinutes === 0 ? 'at the order' : `after ${formatDuration(a.closeAtMinutes)}`}: the ${Math.min(10, a.roads.length)} that cost most.`, style: 'lead' });
    const rows = a.roads.slice(0, 10).map((r) => [
      td(roadName(r.name)),
      td(vph(r.lossVehiclesPerHour), { right: true }),
      td(!r.clearanceTested ? '—' : r.stopsClearance ? 'does not clear' : r.clearanceLossMinutes ? `+${formatDuration(r.clearanceLossMinutes)}` : 'no change', { right: true }),
    ]);
    out.push(dataTable(['*', 90, 90], [th('Road'), th('Loss', 'right'), th('Clearance', 'right')], rows));
  } else if (a.kind === 'lanes') {
    out.push({
      text: `${a.spentLanes} added lane${a.spentLanes === 1 ? '' : 's'} raise the steady rate from ${vph(a.baseVehiclesPerHour)} to ${vph(a.achievedVehiclesPerHour)}${a.exact ? ', the best possible with this budget' : a.boundVehiclesPerHour !== null ? `; no choice can exceed ${vph(a.boundVehiclesPerHour)}` : ''}.`,
      style: 'lead',
    });
    const rows = a.steps.map((s, i) => [td(String(i + 1)), td(roadName(s.name)), td(vph(s.gainVehiclesPerHour), { right: true }), td(vph(s.throughputVehiclesPerHour), { right: true })]);
    if (rows.length) out.push(dataTable([30, '*', 80, 80], [th('Step'), th('Road'), th('Gain', 'right'), th('Then', 'right')], rows));
  } else if (a.kind === 'release-order') {
    out.push({ text: releaseOrderSentence(a), style: 'lead' });
    const windows = releaseWindows(a);
    const rows = a.zones.map((z, i) => [
      td(z.name),
      td(formatCount(z.vehicles), { right: true }),
      td(z.firstDepartureMinutes === null ? '—' : formatDuration(z.firstDepartureMinutes), { right: true }),
      td(windows[i]!.halfGoneMinutes === null ? '—' : formatDuration(windows[i]!.halfGoneMinutes!), { right: true }),
      td(z.lastDepartureMinutes === null ? '—' : formatDuration(z.lastDepartureMinutes + a.stepMinutes), { right: true }),
    ]);
    out.push(dataTable(['*', 70, 70, 70, 70], [th('Zone'), th('Vehicles', 'right'), th('Leave from', 'right'), th('Half by', 'right'), th('Until', 'right')], rows));
  } else {
    return zoneRoutesPage(a, input, ownPage);
  }
  return out;
}

type ZoneRoutesAnswer = Extract<ProposalResult['answer'], { kind: 'zone-routes' }>;
const window = (w: [number, number] | null) => (w ? `${formatDuration(w[0])}–${formatDuration(w[1])}` : '—');

/** "Where each zone goes" on a page of its own: the cautions, the corridors on a map, and the table. */
export function zoneRoutesPage(a: ZoneRoutesAnswer, input: BriefingInput, ownPage = true): Content[] {
  const zones = a.zones.map((z, i) => ({ zoneId: z.zoneId, name: z.name, colour: zoneRouteColour(i) }));
  const rows: TableCell[][] = a.zones.map((z, i) => [
    td(z.name, { bold: true, color: zoneRouteColour(i) }),
    td(z.shelters.map((s) => `${s.name} (${formatCount(s.vehicles)})`).join(', ') || 'none'),
    td(z.mainRoads.map((r) => `${roadName(r.name)} (${formatCount(r.vehicles)})`).join(', ') || '—'),
    td(window(z.departureWindowMinutes), { right: true, noWrap: true }),
    td(window(z.arrivalWindowMinutes), { right: true, noWrap: true }),
  ]);
  return [
    { text: proposalKindTitles['zone-routes'], style: 'h2', ...(ownPage ? { pageBreak: 'before' as const } : {}) },
    { text: `${CAUTION_LINE} ${proposalCaution}`, style: 'note', margin: [0, 0, 0, 6] },
    {
      text:
        `Where each zone’s vehicles go in the plan found, which clears ${a.clearanceMinutes === null ? 'not within the horizon' : `in ${formatDuration(a.clearanceMinutes)}`}: ` +
        'one optimal plan of possibly many, so other routes can carry as many. Lines show each zone’s corridors (roads carrying at least a tenth of its vehicles), wider for more vehicles.',
      style: 'lead',
    },
    { svg: zoneRoutesSvg({ map: input.map, lines: zoneRouteLines(a), zones, width: 516, height: 320 }), width: 516 },
    { text: 'Figure. Each zone’s corridors in the zone’s colour; shelters and exits as green squares; north is up.', style: 'caption' },
    dataTable([72, '*', '*', 82, 82], [th('Zone'), th('Goes to (vehicles)'), th('Main corridors (vehicles)'), th('Leaves', 'right'), th('Arrives', 'right')], rows),
  ];
}

export function searchesSection(input: BriefingInput): Content[] {
  // Where each zone goes last, on a page of its own when other searches come before it.
  const searches = [...(input.searches ?? [])].sort((a, b) => Number(a.answer.kind === 'zone-routes') - Number(b.answer.kind === 'zone-routes'));
  if (searches.length === 0) return [];
  return [
    { text: 'Searches for the best change', style: 'h1' },
    { text: proposalCaution, style: 'note', margin: [0, 0, 0, 6] },
    ...searches.flatMap((r, i) => one(r, input, i > 0)),
  ];
}
