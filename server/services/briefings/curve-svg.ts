// The evacuation curve as an SVG chart: vehicles arrived at a shelter or exit against minutes after the order,
// the number to move as a dashed line, the 50/90/95 % times and the clearance time marked.
// A persons axis on the right reads the same curve at the run's persons per vehicle.
import { formatCount, formatDuration } from '../../../shared/format/numbers';
import { n, polylinePoints, svgText } from './svg-text';

export type CurveSvgInput = {
  stepMinutes: number;
  /** Cumulative vehicles delivered by the end of each step, index 0 = the order. */
  deliveredVehicles: readonly number[];
  demandVehicles: number;
  horizonMinutes: number;
  p50Minutes: number | null;
  p90Minutes: number | null;
  p95Minutes: number | null;
  clearanceMinutes: number | null;
  /** When given, a right-hand axis in persons. */
  personsPerVehicle?: number | undefined;
  width?: number;
  height?: number;
};

export const CURVE_COLOURS = { curve: '#1864ab', demand: '#495057', mark: '#e8590c', clear: '#2b8a3e', grid: '#e9ecef', axis: '#868e96', text: '#343a40' };

/** 1, 2, 2.5 or 5 × 10^k: the smallest such step giving at most `maxTicks` intervals. */
export function niceStep(range: number, maxTicks: number): number {
  if (!(range > 0)) return 1;
  const raw = range / maxTicks;
  const pow = 10 ** Math.floor(Math.log10(raw));
  for (const m of [1, 2, 2.5, 5, 10]) if (m * pow >= raw) return m * pow;
  return 10 * pow;
}

/** Minute ticks that read as clock time: 5, 10, 15, 30 min, then whole hours. */
export function minuteStep(horizon: number, maxTicks = 9): number {
  for (const s of [5, 10, 15, 30, 60, 120, 180, 240, 360, 480, 720]) if (horizon / s <= maxTicks) return s;
  return 1440;
}

export function curveSvg(input: CurveSvgInput): string {
  const width = input.width ?? 516;
  const height = input.height ?? 250;
  const left = 56;
  const right = input.personsPerVehicle ? 58 : 16;
  const top = 16;
  const bottom = 40;
  const plotW = width - left - right;
  const plotH = height - top - bottom;
  const maxDelivered = input.deliveredVehicles.reduce((m, v) => Math.max(m, v), 0);
  const yMax = Math.max(input.demandVehicles, maxDelivered, 1) * 1.1;
  const xMax = Math.max(input.horizonMinutes, input.stepMinutes);
  const X = (minutes: number) => left + (Math.min(minutes, xMax) / xMax) * plotW;
  const Y = (vehicles: number) => top + plotH - (vehicles / yMax) * plotH;
  const out: string[] = [`<svg xmlns="http://www.w3.org/2000/svg" width="${width}" height="${height}" viewBox="0 0 ${width} ${height}">`];
  const small = (x: number, y: number, s: string, anchor: 'start' | 'middle' | 'end' = 'middle', fill = CURVE_COLOURS.text) =>
    svgText(x, y, s, { size: 7.5, fill, anchor });

  // Grid and axes.
  const yStep = niceStep(yMax, 6);
  for (let v = 0; v <= yMax + 1e-9; v += yStep) {
    out.push(`<line x1="${n(left)}" y1="${n(Y(v))}" x2="${n(left + plotW)}" y2="${n(Y(v))}" stroke="${CURVE_COLOURS.grid}" stroke-width="0.7"/>`);
    out.push(small(left - 5, Y(v) + 2.6, formatCount(v), 'end'));
  }
  const xStep = minuteStep(xMax);
  for (let m = 0; m <= xMax + 1e-9; m += xStep) {
    out.push(`<line x1="${n(X(m))}" y1="${n(top + plotH)}" x2="${n(X(m))}" y2="${n(top + plotH + 3)}" stroke="${CURVE_COLOURS.axis}" stroke-width="0.7"/>`);
    out.push(small(X(m), top + plotH + 12, formatCount(m)));
  }
  out.push(
    `<line x1="${n(left)}" y1="${n(top + plotH)}" x2="${n(left + plotW)}" y2="${n(top + plotH)}" stroke="${CURVE_COLOURS.axis}" stroke-width="0.8"/>`,
    `<line x1="${n(left)}" y1="${n(top)}" x2="${n(left)}" y2="${n(top + plotH)}" stroke="${CURVE_COLOURS.axis}" stroke-width="0.8"/>`,
    small(left + plotW / 2, height - 8, 'Minutes after the evacuation order'),
    `<text x="0" y="0" font-family="Roboto" font-size="7.5" fill="${CURVE_COLOURS.text}" text-anchor="middle" transform="translate(${n(14)} ${n(top + plotH / 2)}) rotate(-90)">Vehicles arrived</text>`,
  );
  if (input.personsPerVehicle) {
    const ppv = input.personsPerVehicle;
    const pStep = niceStep(yMax * ppv, 6);
    const axisX = left + plotW;
    out.push(`<line x1="${n(axisX)}" y1="${n(top)}" x2="${n(axisX)}" y2="${n(top + plotH)}" stroke="${CURVE_COLOURS.axis}" stroke-width="0.8"/>`);
    for (let p = 0; p <= yMax * ppv + 1e-9; p += pStep) {
      const y = Y(p / ppv);
      out.push(`<line x1="${n(axisX)}" y1="${n(y)}" x2="${n(axisX + 3)}" y2="${n(y)}" stroke="${CURVE_COLOURS.axis}" stroke-width="0.7"/>`);
      out.push(small(axisX + 5, y + 2.6, formatCount(p), 'start'));
    }
    out.push(
      `<text x="0" y="0" font-family="Roboto" font-size="7.5" fill="${CURVE_COLOURS.text}" text-anchor="middle" transform="translate(${n(width - 8)} ${n(top + plotH / 2)}) rotate(-90)">Persons (at ${ppv.toFixed(2).replace(/0$/, '')} per vehicle)</text>`,
    );
  }

  // The number to move.
  const yd = Y(input.demandVehicles);
  out.push(
    `<line x1="${n(left)}" y1="${n(yd)}" x2="${n(left + plotW)}" y2="${n(yd)}" stroke="${CURVE_COLOURS.demand}" stroke-width="1" stroke-dasharray="5 3"/>`,
    svgText(left + 6, yd - 4, `To move: ${formatCount(input.demandVehicles)} vehicles`, { size: 7.5, fill: CURVE_COLOURS.demand, halo: true }),
  );

  // The curve, with a light wash underneath so its shape reads at a glance.
  const pts: [number, number][] = [];
  input.deliveredVehicles.forEach((v, i) => {
    const m = i * input.stepMinutes;
    if (m <= xMax + 1e-9) pts.push([X(m), Y(v)]);
  });
  if (pts.length > 0) {
    const last = pts[pts.length - 1]!;
    out.push(`<path d="M ${n(left)} ${n(top + plotH)} L ${pts.map(([x, y]) => `${n(x)} ${n(y)}`).join(' L ')} L ${n(last[0])} ${n(top + plotH)} Z" fill="${CURVE_COLOURS.curve}" fill-opacity="0.08"/>`);
    out.push(`<polyline points="${polylinePoints(pts)}" fill="none" stroke="${CURVE_COLOURS.curve}" stroke-width="1.8" stroke-linejoin="round"/>`);
  }

  // 50/90/95 % marks. Each label sits just left of its point, at the same height: on a rising
  // curve that space is above the curve and below the later marks, so it is always empty.
  const marks: [number, number | null][] = [
    [0.5, input.p50Minutes],
    [0.9, input.p90Minutes],
    [0.95, input.p95Minutes],
  ];
  for (const [share, minutes] of marks) {
    if (minutes === null) continue;
    const x = X(minutes);
    const y = Y(share * input.demandVehicles);
    out.push(
      `<line x1="${n(x)}" y1="${n(y)}" x2="${n(x)}" y2="${n(top + plotH)}" stroke="${CURVE_COLOURS.mark}" stroke-width="0.8" stroke-dasharray="2 2"/>`,
      `<circle cx="${n(x)}" cy="${n(y)}" r="2.6" fill="${CURVE_COLOURS.mark}" stroke="#ffffff" stroke-width="0.8"/>`,
      svgText(x - 6, y + 2.6, `${Math.round(share * 100)} % by ${formatDuration(minutes)}`, { size: 7.5, fill: CURVE_COLOURS.mark, anchor: 'end', weight: 'bold', halo: true }),
    );
  }
  if (input.clearanceMinutes !== null) {
    const x = X(input.clearanceMinutes);
    // The label runs right of the line unless the line is near the right edge.
    const roomRight = left + plotW - x > 130;
    out.push(
      `<line x1="${n(x)}" y1="${n(top)}" x2="${n(x)}" y2="${n(top + plotH)}" stroke="${CURVE_COLOURS.clear}" stroke-width="1"/>`,
      svgText(roomRight ? x + 5 : x - 5, top + 8, `All arrived by ${formatDuration(input.clearanceMinutes)}`, {
        size: 7.5,
        fill: CURVE_COLOURS.clear,
        anchor: roomRight ? 'start' : 'end',
        weight: 'bold',
        halo: true,
      }),
    );
  } else {
    out.push(
      svgText(left + plotW - 4, top + 8, `Not everyone has arrived within ${formatDuration(input.horizonMinutes)}`, {
        size: 7.5,
        fill: CURVE_COLOURS.mark,
        anchor: 'end',
        weight: 'bold',
        halo: true,
      }),
    );
  }
  out.push('</svg>');
  return out.join('');
}
