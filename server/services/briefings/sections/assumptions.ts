// What the figures rest on: data version, capacity table with each value's source, persons per
// vehicle, departure curve, time step, horizon, engine and algorithm, and the method by name.
import type { Content, TableCell } from 'pdfmake/interfaces';
import type { BriefingInput } from '../briefing-input';
import { formatCount, formatDateTime, formatDecimal, formatSpan, formatStep } from '../../../../shared/format/numbers';
import { COLOURS, dataTable, td, th } from './document-styles';
import type { UnitSystem } from '../../../../shared/api/units';
import { formatDensity, speedFromKmh, speedUnit } from '../../../../shared/format/units';
import { algorithmWords } from '../../../../shared/format/engine-words';
import { tripTimesMethod, tripTimesWarning } from '../../../../shared/format/trip-times';
import { CAPACITY_FACTOR_PRESETS } from '../../../../shared/model/capacity-factors';
import { ZONE_DEFAULTS } from '../../../../shared/model/zone-defaults';

function keyValue(rows: [string, string][]): Content {
  return {
    table: { widths: [120, '*'], body: rows.map(([k, v]) => [{ text: k, style: 'th', margin: [0, 1, 0, 0] }, { text: v, fontSize: 8.5 }]) },
    layout: {
      hLineWidth: (i: number, node: { table: { body: unknown[] } }) => (i === 0 || i === node.table.body.length ? 0 : 0.35),
      vLineWidth: () => 0,
      hLineColor: () => COLOURS.rule,
      paddingLeft: () => 0,
      paddingRight: () => 6,
      paddingTop: () => 3,
      paddingBottom: () => 3,
    },
  };
}

/** The ready-made factor a run's factor equals, with its source; '' for a factor of the planner's own. */
function factorPresetWords(factor: number): string {
  const preset = CAPACITY_FACTOR_PRESETS.find((f) => Math.abs(f.factor - factor) < 1e-9);
  return preset ? `; equals the preset “${preset.label}”: ${preset.source}` : '; a value set by the planner';
}

/** Jam density used for queue space (storage = jam density × lanes × length), with its source. */
function jamDensityWords(rows: BriefingInput['assumptions']['capacityTable'], system: UnitSystem): string {
  const distinct = [...new Map(rows.filter((r) => r.jamDensityVehPerKmPerLane !== undefined).map((r) => [`${r.jamDensityVehPerKmPerLane}|${r.jamDensitySource ?? ''}`, r])).values()];
  if (distinct.length === 0) return 'jam density not stated in the capacity table';
  return distinct.map((r) => `jam density ${formatDensity(r.jamDensityVehPerKmPerLane!, system)}${r.jamDensitySource ? ` — ${r.jamDensitySource}` : ''}`).join('; ') + '; storage = jam density × lanes × length';
}

export function assumptionsSection(input: BriefingInput): Content[] {
  const { run, result, assumptions: a } = input;
  const units = input.unitSystem ?? 'metric';
  const p = run.parameters;
  const s = result.stats;
  const tripWarning = result.routeTiming ? tripTimesWarning(result.routeTiming) : null;
  const requested = p.algorithm === 'auto' ? 'automatic choice' : algorithmWords(p.algorithm);
  const rows: [string, string][] = [
    ['Data version', `${run.dataVersion}: ${a.dataDescription}`],
    ['Scenario', input.scenarioName ?? 'none (the plan’s own data)'],
    ['Horizon', `${formatSpan(p.horizonMinutes)} after the evacuation order`],
    ['Time step', formatStep(p.timeStepSeconds)],
    ['Capacity factor', `${formatDecimal(p.capacityFactor)} on every lane capacity${a.capacityFactorNote ? ` — ${a.capacityFactorNote}` : ''}${factorPresetWords(p.capacityFactor)}`],
    ['Queue space', jamDensityWords(a.capacityTable, units)],
    ...(a.participation ? ([['Participation', a.participation]] as [string, string][]) : []),
    ['Persons per vehicle', `${formatDecimal(a.personsPerVehicle)} — ${a.personsPerVehicleSource}${/from memory/.test(a.personsPerVehicleSource) ? '' : `; the default of ${formatDecimal(ZONE_DEFAULTS.personsPerVehicle)} is ${ZONE_DEFAULTS.personsPerVehicleSource}`}`],
    ['Departure curve', a.departureCurve],
    ['Engine', `${s.engineVersion}; algorithm ${algorithmWords(s.algorithm)} (requested: ${requested})`],
    [
      'Model size',
      `${formatCount(s.nodes)} nodes and ${formatCount(s.arcs)} arcs; ${formatCount(s.expandedNodes)} nodes and ${formatCount(s.expandedArcs)} arcs over time`,
    ],
    ['Result check', s.verified ? 'flow conservation, capacity bounds and cut = flow checked after solving' : 'not verified after solving'],
    ['Run', `${run.id}${run.finishedAt ? `, finished ${formatDateTime(new Date(run.finishedAt), input.timeZone)}` : ''}`],
  ];

  const capRows: TableCell[][] = a.capacityTable.map((r) => [
    td(r.roadClass.replace(/_/g, ' ')),
    td(String(r.lanesPerDirection), { right: true }),
    td(formatCount(speedFromKmh(r.speedKmh, units)), { right: true }),
    td(formatCount(r.capacityVehPerHourPerLane), { right: true }),
    {
      stack: [
        { text: [{ text: 'Capacity: ', bold: true }, r.capacitySource] },
        { text: [{ text: 'Lanes: ', bold: true }, r.lanesSource] },
        { text: [{ text: 'Speed: ', bold: true }, r.speedSource] },
      ],
      fontSize: 6.8,
      color: COLOURS.muted,
      lineHeight: 1.2,
    },
  ]);

  return [
    { text: 'Assumptions', style: 'h1' },
    keyValue(rows),
    { text: 'Capacity table', style: 'h2', margin: [0, 14, 0, 4] },
    dataTable([62, 34, 34, 44, '*'], [th('Road class'), th('Lanes\nper dir.', 'right'), th(speedUnit(units), 'right'), th('veh/h/lane', 'right'), th('Sources')], capRows),
    {
      text: 'Per-segment values from the road data (lanes, speed limits, closures) replace these defaults where present. Arc capacity = lanes × per-lane capacity × capacity factor.',
      style: 'note',
      margin: [0, 4, 0, 0],
    },
    { text: 'Method', style: 'h2', margin: [0, 14, 0, 4] },
    {
      text:
        'Evacuees per hour is the maximum flow from the evacuation zones to the shelters through the road network at steady state; the choke points are a minimum cut of that flow (max-flow min-cut theorem, Ford & Fulkerson). ' +
        'The evacuation curve and the clearance time come from a time-expanded network, in which each road is copied for every time step and vehicles may wait (Chalmet, Francis & Saunders 1982; Ford & Fulkerson 1958). ' +
        'The maximum flow is computed with the algorithm named above (Edmonds & Karp 1972; Dinic 1970). The curve is the most that any routing could deliver by each minute under these inputs.',
      fontSize: 8.5,
      lineHeight: 1.3,
    },
    { text: tripTimesMethod(p.timeStepSeconds, result.routeTiming), fontSize: 8.5, lineHeight: 1.3, margin: [0, 6, 0, 0] },
    ...(tripWarning ? [{ text: tripWarning, fontSize: 8.5, lineHeight: 1.3, color: COLOURS.warn, margin: [0, 4, 0, 0] } as Content] : []),
  ];
}
