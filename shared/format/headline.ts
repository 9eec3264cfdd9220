// The headline figures of a result in words, once for the workspace's tiles and the briefing's
// panels, so both print the same labels, values and notes. The model counts vehicles that have
// arrived at a shelter or an exit within the horizon; the words claim no more than that.
import type { RunResult } from '../api/runs';
import { formatCount, formatDuration, formatShare } from './numbers';

export type HeadlineFigure = {
  key: 'throughput' | 'arrived' | 'clearance' | 'p50' | 'p90' | 'p95';
  label: string;
  value: string;
  notes: string[];
};

/** Why the 90 % time is shown (its source named beside it). */
export const NINETY_PERCENT_NOTE = 'Evacuation time estimates are often reported at 90 % and 100 % (US NRC NUREG/CR-7002, 2011).';

/** Minutes of the curve's tail whose arrival rate the extrapolation carries on. */
const TREND_MINUTES = 60;

/**
 * When everyone would have arrived if the arrival rate of the horizon's last hour held on:
 * horizon + vehicles still to arrive ÷ that rate. An extrapolation, not a model result; null
 * when everyone arrived, or when nobody arrived in that last hour (no trend to carry on).
 */
export function extrapolatedClearanceMinutes(result: Pick<RunResult, 'headline' | 'curve'>): number | null {
  const { deliveredVehicles, stepMinutes } = result.curve;
  const h = result.headline;
  const remaining = h.demandVehicles - h.deliveredVehicles;
  if (h.clearanceMinutes !== null || remaining <= 0 || deliveredVehicles.length < 2 || !(stepMinutes > 0)) return null;
  const last = deliveredVehicles.length - 1;
  const back = Math.min(last, Math.max(1, Math.round(TREND_MINUTES / stepMinutes)));
  const perMinute = (deliveredVehicles[last]! - deliveredVehicles[last - back]!) / (back * stepMinutes);
  if (!(perMinute > 0)) return null;
  return last * stepMinutes + remaining / perMinute;
}

function timeFigure(key: 'p50' | 'p90' | 'p95', pct: number, minutes: number | null, horizonMinutes: number, note: string): HeadlineFigure {
  return {
    key,
    label: `${pct} % arrived after`,
    value: minutes === null ? `Over ${formatDuration(horizonMinutes)}` : formatDuration(minutes),
    notes: [minutes === null ? `Not within the ${formatDuration(horizonMinutes)} horizon.` : `${formatCount(minutes)} minutes after the order.`, note],
  };
}

export function headlineFigures(result: Pick<RunResult, 'headline' | 'curve'>): HeadlineFigure[] {
  const h = result.headline;
  const horizon = formatDuration(h.horizonMinutes);
  const share = h.demandPersons > 0 ? formatShare(h.deliveredPersons / h.demandPersons) : '–';
  const extrapolated = extrapolatedClearanceMinutes(result);
  return [
    {
      key: 'throughput',
      label: 'Evacuees per hour',
      value: `${formatCount(h.steadyStatePersonsPerHour)} persons/h`,
      notes: [`${formatCount(h.steadyStateVehiclesPerHour)} veh/h once traffic is steady: the most the roads carry (an upper bound).`],
    },
    {
      key: 'arrived',
      label: `Arrived within ${horizon}`,
      value: `${formatCount(h.deliveredPersons)} persons`,
      notes: [
        `${share} of ${formatCount(h.demandPersons)} persons leaving are at a shelter or exit.`,
        `Vehicles arrived: ${formatCount(h.deliveredVehicles)} of ${formatCount(h.demandVehicles)}.`,
      ],
    },
    {
      key: 'clearance',
      label: 'Clearance time',
      value: h.clearanceMinutes === null ? `Over ${horizon}` : formatDuration(h.clearanceMinutes),
      notes:
        h.clearanceMinutes === null
          ? [
              `${share} arrived by the ${horizon} horizon.`,
              extrapolated === null
                ? "No arrivals in the horizon's last hour to extrapolate a clearance time from."
                : `About ${formatDuration(extrapolated)} if the last hour's arrival rate holds (an extrapolation, not a model result).`,
            ]
          : ['From the order until the last vehicle is at a shelter or exit.'],
    },
    timeFigure('p50', 50, h.p50Minutes, h.horizonMinutes, 'Half of those leaving have arrived.'),
    timeFigure('p90', 90, h.p90Minutes, h.horizonMinutes, NINETY_PERCENT_NOTE),
    timeFigure('p95', 95, h.p95Minutes, h.horizonMinutes, 'All but the last one in twenty.'),
  ];
}
