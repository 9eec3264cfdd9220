// Result colours: a warm sequential ramp for the share of an arc's capacity in use at steady
// state, and one contrasting look (deep violet over a white casing) for the choke points, so
// that they read on any part of the ramp. Pure: colours and path options only.
import { CHOKE_POINT_COLOUR } from '@shared/format/colours';
import type { LineStyle } from './road-style';

export type UtilisationBand = { from: number; label: string; color: string };

/** Bands by lower bound; an arc falls in the last band whose `from` it reaches. */
export const utilisationBands: readonly UtilisationBand[] = [
  { from: 0, label: 'No flow', color: '#c3ccd3' },
  { from: 1e-9, label: 'Under 25 %', color: '#f6dd8b' },
  { from: 0.25, label: '25–50 %', color: '#f3b44f' },
  { from: 0.5, label: '50–75 %', color: '#e9802f' },
  { from: 0.75, label: '75–95 %', color: '#cf4a24' },
  { from: 0.95, label: '95 % and over', color: '#8e1b16' },
];

export function utilisationBand(utilisation: number): UtilisationBand {
  const u = Number.isFinite(utilisation) ? utilisation : 0;
  let band = utilisationBands[0]!;
  for (const b of utilisationBands) if (u >= b.from) band = b;
  return band;
}

export const utilisationColor = (utilisation: number) => utilisationBand(utilisation).color;

/** Arcs in use get wider with their load, so the busy routes read before the colours do. */
export function utilisationStyle(utilisation: number, baseWeight: number): LineStyle {
  const u = Math.max(0, Math.min(1, Number.isFinite(utilisation) ? utilisation : 0));
  if (u === 0) return { color: utilisationColor(0), weight: Math.max(1, baseWeight * 0.7), opacity: 0.7, lineCap: 'round' };
  return { color: utilisationColor(u), weight: Math.round((baseWeight + 3 * u) * 10) / 10, opacity: 0.95, lineCap: 'round' };
}

export const chokePointColor = CHOKE_POINT_COLOUR;
export const chokePointCasing: LineStyle = { color: '#ffffff', weight: 13, opacity: 0.95, lineCap: 'round' };
export const chokePointLine: LineStyle = { color: chokePointColor, weight: 7, opacity: 1, lineCap: 'round' };
/** The one picked in the table: thicker and with a bright edge. */
export const chokePointSelected: LineStyle = { color: '#b5521f', weight: 9, opacity: 1, lineCap: 'round' };
