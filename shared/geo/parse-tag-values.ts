// Readers for single tag values. Each returns `undefined` for "not given" and `null` for
// "given but unreadable", so the caller can tell a default from a data problem.
import { KM_PER_MILE } from '../model/hcm';

const KM_PER_NAUTICAL_MILE = 1.852;

export type Parsed<T> = T | null | undefined;

function text(value: unknown): string | undefined {
  if (value === undefined || value === null) return undefined;
  if (typeof value === 'number' || typeof value === 'boolean') return String(value);
  if (typeof value !== 'string') return '';
  const trimmed = value.trim();
  return trimmed === '' ? undefined : trimmed;
}

/** A lane count: a whole number 0–16 ("2"; 2). */
export function parseLaneCount(value: unknown): Parsed<number> {
  const t = text(value);
  if (t === undefined) return undefined;
  if (!/^\d+$/.test(t)) return null;
  const n = Number(t);
  return n <= 16 ? n : null;
}

/**
 * A speed limit in km/h: "50", "50 km/h", "30 mph", "10 knots" (OSM Key:maxspeed units);
 * bare numbers are in `bareUnit`. "none" (no limit) gives undefined: the class default
 * applies. Anything else (zone codes like "DE:urban", "signals", lists) is unreadable.
 */
export function parseSpeedKmh(value: unknown, bareUnit: 'kmh' | 'mph' = 'kmh'): Parsed<number> {
  const t = text(value);
  if (t === undefined) return undefined;
  if (t.toLowerCase() === 'none') return undefined;
  const m = /^(\d+(?:\.\d+)?)\s*(km\/h|kmh|kph|mph|knots)?$/i.exec(t);
  if (!m) return null;
  const n = Number(m[1]);
  if (!(n > 0) || n > 300) return null;
  const unit = (m[2] ?? (bareUnit === 'mph' ? 'mph' : 'km/h')).toLowerCase();
  if (unit === 'mph') return n * KM_PER_MILE;
  if (unit === 'knots') return n * KM_PER_NAUTICAL_MILE;
  return n;
}

export type OnewayValue = 'forward' | 'backward' | 'both' | 'reversible';

/**
 * OSM Key:oneway values (yes/-1/no, reversible, alternating) plus the usual GIS spellings:
 * true/1/Y/FT along the digitised direction, TF/reverse against it, false/0/B/N both ways.
 */
export function parseOneway(value: unknown): Parsed<OnewayValue> {
  const t = text(value)?.toLowerCase();
  if (t === undefined) return undefined;
  if (['yes', 'true', '1', 'y', 'ft'].includes(t)) return 'forward';
  if (['-1', 'tf', 'reverse', 'backward'].includes(t)) return 'backward';
  if (['no', 'false', '0', 'b', 'n', 'both'].includes(t)) return 'both';
  if (t === 'reversible' || t === 'alternating') return 'reversible';
  return null;
}

/** bridge=*, tunnel=*: anything but "no"/false/0 means yes (bridge=viaduct, tunnel=culvert…). */
export function parseFlag(value: unknown): Parsed<boolean> {
  const t = text(value)?.toLowerCase();
  if (t === undefined) return undefined;
  return !['no', 'false', '0', 'n', 'f'].includes(t);
}

/** A layer: a whole number, possibly negative. */
export function parseLayer(value: unknown): Parsed<number> {
  const t = text(value);
  if (t === undefined) return undefined;
  if (!/^[+-]?\d+$/.test(t)) return null;
  const n = Number(t);
  return n >= -10 && n <= 10 ? n : null;
}

/** A free-text value, or undefined when empty. */
export function parseText(value: unknown): string | undefined {
  const t = text(value);
  return t === '' ? undefined : t;
}
