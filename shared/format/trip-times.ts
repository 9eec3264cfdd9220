// How far the model's trip times lie from free flow (RunResult.routeTiming), in the words the
// Findings tab and the briefing both print: one line of what was measured, a warning with a
// concrete step to try when the difference passes one time step (the bound the rounding keeps
// on routes over the fastest roads) on some fastest trip or for most of the routes the plan
// drives, and the time model for the briefing's Method section.
import type { RouteTiming } from '../api/runs';
import { formatCount, formatStep } from './numbers';

/** Seconds of a trip or a difference: 45 → "45 s", 228 → "3.8 min", 4500 → "1 h 15 min". */
export function formatTripSeconds(seconds: number): string {
  if (!Number.isFinite(seconds)) return '–';
  const s = Math.round(seconds);
  if (s < 90) return `${s} s`;
  if (s < 3600) return `${(Math.round(s / 6) / 10).toFixed(1)} min`;
  const minutes = Math.round(s / 60);
  const m = minutes % 60;
  return m === 0 ? `${Math.floor(minutes / 60)} h` : `${Math.floor(minutes / 60)} h ${String(m).padStart(2, '0')} min`;
}

/** Some fastest zone–shelter trip is more than one step off free flow: the rounding's bound on fastest routes is exceeded. */
export function fastestTripsPastBound(t: RouteTiming): boolean {
  return t.worst !== null && t.largestSeconds > t.timeStepSeconds + 1e-9;
}

/**
 * Most of the plan's vehicles (the vehicle-weighted median of its routes) drive a route modelled
 * more than one step off its own free-flow time. Those routes can be far off even when every
 * fastest trip is within the bound: they run against the direction the steps were rounded for.
 */
export function plannedRoutesPastBound(t: RouteTiming): boolean {
  const planned = t.plannedRoutes;
  return planned !== undefined && planned.vehicles > 0 && planned.typicalSeconds > t.timeStepSeconds + 1e-9;
}

/** Past one step on the fastest trips or on most of the plan's routes: the result warns. */
export function tripTimesPastBound(t: RouteTiming): boolean {
  return fastestTripsPastBound(t) || plannedRoutesPastBound(t);
}

/** One sentence: the largest and typical difference over the zone–shelter pairs, against one step. */
export function tripTimesSummary(t: RouteTiming): string {
  if (t.pairs === 0 || t.worst === null) return 'No zone reaches a shelter or exit at free flow, so there are no trip times to compare.';
  const step = formatStep(t.timeStepSeconds);
  const within = fastestTripsPastBound(t) ? 'more than one time step' : 'within one time step';
  const fastest =
    `Fastest trips from each zone to each shelter or exit (${t.pairs} pairs) take up to ${formatTripSeconds(t.largestSeconds)} ` +
    `longer or shorter in the model than at free flow, typically ${formatTripSeconds(t.typicalSeconds)}: ${within} (${step}).`;
  const planned = t.plannedRoutes;
  if (!planned || planned.vehicles === 0) return fastest;
  return (
    `${fastest} The routes the plan's ${formatCount(planned.vehicles)} vehicles drive are modelled up to ${formatTripSeconds(planned.largestSeconds)} ` +
    `off their own free-flow times, typically ${formatTripSeconds(planned.typicalSeconds)}; ${Math.round(100 * planned.withinOneStepShare)} % of those vehicles are within one time step.`
  );
}

/**
 * The warning past one step, naming the worst pair (when the fastest trips pass the bound) and
 * the plan's routes (when most of them do), with the step to try; null within the bound.
 */
export function tripTimesWarning(t: RouteTiming): string | null {
  const fastest = fastestTripsPastBound(t) && t.worst !== null;
  const planned = plannedRoutesPastBound(t) ? t.plannedRoutes! : null;
  if (!fastest && planned === null) return null;
  const step = formatStep(t.timeStepSeconds);
  const advice =
    t.suggestedStepSeconds !== null
      ? `Analyse again with a time step of ${formatStep(t.suggestedStepSeconds)}: that should bring the difference within ${step}.`
      : 'Analyse again with a shorter time step: the difference shrinks about in proportion to the step.';
  const parts: string[] = [];
  if (fastest) {
    const w = t.worst!;
    const slower = w.modelledSeconds >= w.freeFlowSeconds ? 'late' : 'early';
    parts.push(
      `Trip times in the model are up to ${formatTripSeconds(t.largestSeconds)} off free flow, more than one time step (${step}). ` +
        `The fastest trip from ${w.zoneName} to ${w.shelterName} takes ${formatTripSeconds(w.freeFlowSeconds)} at free flow and ` +
        `${formatTripSeconds(w.modelledSeconds)} in the model, so arrivals, the curve and the clearance time may come that much ${slower}.`,
    );
  }
  if (planned !== null) {
    // No route is modelled more than one step faster than at free flow (docs/model.md §1), so a
    // typical difference past one step is a delay.
    parts.push(
      `Most of the routes the plan's ${formatCount(planned.vehicles)} vehicles drive are modelled more than one time step (${step}) slower than at free flow: ` +
        `typically ${formatTripSeconds(planned.typicalSeconds)}, up to ${formatTripSeconds(planned.largestSeconds)}; ` +
        `only ${Math.round(100 * planned.withinOneStepShare)} % of those vehicles are within one step, so arrivals, the curve and the clearance time may come that much late.`,
    );
  }
  const cause = fastest && planned === null
    ? 'The cause is roads off the fastest trips, each rounded up to whole steps.'
    : 'The cause is roads driven against the direction their steps were rounded for (towards the nearest shelter or exit, or out of the nearest zone), each rounded up to a whole step.';
  return `${parts.join(' ')} ${cause} ${advice}`;
}

/** The time model and its bound, for the briefing's Method section (with this run's figures when stored). */
export function tripTimesMethod(timeStepSeconds: number, t: RouteTiming | undefined): string {
  const step = formatStep(timeStepSeconds);
  const model =
    `Travel times are counted in whole time steps of ${step}. Each road's steps are rounded against node time potentials ` +
    '(the free-flow time from each junction to the nearest shelter or exit, or from the nearest zone), so that rounding errors do not add up along a route ' +
    '(as in condensed time-expanded networks, Fleischer & Skutella 2007): a trip along a fastest route to the nearest shelter or exit (or, when that potential is used, out of the nearest zone) is modelled within one time step of its free-flow travel time, however short its roads. ' +
    'Other trips are not bounded this way: each road on them that lies off those fastest routes can add up to one step. ' +
    'No trip is modelled more than one time step faster than at free flow. ' +
    "The routes the plan's vehicles drive are measured against their own free-flow times; where most of them are more than one step off, the findings warn. " +
    'Travel times are free-flow times; queues form only where capacity runs out.';
  return t === undefined ? model : `${model} In this analysis: ${tripTimesSummary(t)}`;
}
