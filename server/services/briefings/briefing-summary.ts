// The one-paragraph summary in plain words, built from the stored figures only.
import type { BriefingInput } from './briefing-input';
import { formatCount, formatDuration, formatShare, formatSpan } from '../../../shared/format/numbers';
import { rankedChokePoints, rankFixes } from './rankings';
import { roadNamer } from './road-labels';

function listInWords(items: string[]): string {
  if (items.length <= 1) return items.join('');
  return `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}

export function briefingSummary(input: BriefingInput): string {
  const h = input.result.headline;
  const roads = roadNamer(input.map);
  const parts: string[] = [];

  parts.push(
    `Under the assumptions set out in this briefing, the roads from the evacuation zones to the shelters and exits can carry at most about ` +
      `${formatCount(h.steadyStatePersonsPerHour)} people (${formatCount(h.steadyStateVehiclesPerHour)} vehicles) per hour once traffic is flowing.`,
  );

  const horizon = formatSpan(h.horizonMinutes);
  if (h.demandVehicles <= 0) {
    parts.push('No one is expected to leave in this run, so there is nothing to clear.');
  } else if (h.clearanceMinutes !== null) {
    parts.push(
      `All ${formatCount(h.demandPersons)} people expected to leave (${formatCount(h.demandVehicles)} vehicles) arrive at a shelter or exit within the ${horizon} studied; ` +
        `the last arrives ${formatDuration(h.clearanceMinutes)} after the evacuation order.`,
    );
  } else {
    const remainingPersons = Math.max(0, h.demandPersons - h.deliveredPersons);
    parts.push(
      `Of the ${formatCount(h.demandPersons)} people expected to leave (${formatCount(h.demandVehicles)} vehicles), ${formatCount(h.deliveredPersons)} arrive at a shelter or exit within the ${horizon} studied; ` +
        `about ${formatCount(remainingPersons)} (${formatShare(remainingPersons / h.demandPersons)}) are still on the way when that period ends.`,
    );
  }

  const times: string[] = [];
  if (h.p50Minutes !== null) times.push(`half have arrived after ${formatDuration(h.p50Minutes)}`);
  if (h.p90Minutes !== null) times.push(`90 % after ${formatDuration(h.p90Minutes)}`);
  if (h.p95Minutes !== null) times.push(`95 % after ${formatDuration(h.p95Minutes)}`);
  if (times.length > 0) parts.push(`${times.join(', ').replace(/^./, (c) => c.toUpperCase())}.`);

  const chokePoints = rankedChokePoints(input.result).slice(0, 3);
  if (chokePoints.length > 0) {
    parts.push(`The choke points, the roads that set the limit, are ${listInWords(chokePoints.map((b) => roads.label(b)))}.`);
  }
  const [best] = rankFixes(input.result);
  if (best) {
    const change = best.kind === 'add-lane' ? `adding a lane on ${roads.label(best)}` : `reopening ${roads.label(best)}`;
    parts.push(`The most valuable single change tested is ${change}, worth about ${formatCount(best.gainVehiclesPerHour)} more vehicles per hour.`);
  }
  parts.push('These figures are an upper bound for planning, not a timetable or an order.');
  return parts.join(' ');
}
