// The zones' departure curves in words for the briefing's assumptions: one phrase per distinct
// curve, naming the zones that use it. Pure.
import type { DepartureCurve } from '../../../shared/api/zone-shelter-attributes';
import { formatDecimal } from '../../../shared/format/numbers';

const S_CURVE_SOURCE = 'Li, Ozbay, Bartin et al. 2013, TRR 2376';

export function departureCurveWords(curve: DepartureCurve): string {
  switch (curve.kind) {
    case 'allAtOnce':
      return 'everyone leaves at the order';
    case 'uniform':
      return `departures spread evenly over ${formatDecimal(curve.durationHours)} h`;
    case 'logistic':
      return `logistic S-curve, response rate ${formatDecimal(curve.responseRatePerHour)} per hour, half of the residents gone ${formatDecimal(curve.halfLoadingHours)} h after the order`;
    case 'rayleigh':
      return `Rayleigh curve, σ = ${formatDecimal(curve.sigmaHours)} h (most departures within ${formatDecimal(curve.sigmaHours * 2)} h)`;
  }
}

export function departureCurvesDescription(zones: readonly { name: string; departureCurve: DepartureCurve }[]): string {
  if (zones.length === 0) return 'no zones';
  const groups = new Map<string, { words: string; names: string[] }>();
  for (const z of zones) {
    const key = JSON.stringify(z.departureCurve);
    const group = groups.get(key) ?? { words: departureCurveWords(z.departureCurve), names: [] };
    group.names.push(z.name);
    groups.set(key, group);
  }
  const sCurves = zones.some((z) => z.departureCurve.kind === 'logistic' || z.departureCurve.kind === 'rayleigh');
  const source = sCurves ? ` (S-shaped forms: ${S_CURVE_SOURCE})` : '';
  if (groups.size === 1) return `${[...groups.values()][0]!.words}, for every zone${source}`;
  return `${[...groups.values()].map((g) => `${g.names.join(', ')}: ${g.words}`).join('; ')}${source}`;
}
