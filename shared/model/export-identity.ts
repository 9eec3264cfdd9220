// What every export carries besides its data: the caution, and which plan, run and assumptions
// the figures come from, as key–value pairs. Each format writes them its own way: a `cutline`
// member in GeoJSON, leading comment lines in CSV, a metadata table in GeoPackage, the document's
// description in KML, a text file beside a Shapefile.
import { CAUTION_LINE } from '../api/caution';
import type { RunParameters } from '../api/runs';

export type ExportIdentity = {
  /** What the file holds, e.g. "Run results: roads". */
  contents: string;
  planId: string;
  planName: string;
  /** The plan's data version the file reflects (after edits and closures). */
  dataVersion: number;
  exportedAt: string;
  run?: { id: string; finishedAt: string | null; scenarioName: string | null; parameters: RunParameters; engineVersion: string | null } | null;
  roadLayer?: { name: string; sourceFileName: string | null } | null;
  /** Further assumptions in words (e.g. the capacity table's adjustment). */
  notes?: readonly string[];
};

/** Key–value pairs, caution first; keys are stable (snake_case) so other tools can read them. */
export function identityEntries(i: ExportIdentity): [string, string][] {
  const out: [string, string][] = [
    ['caution', CAUTION_LINE],
    ['contents', i.contents],
    ['plan', i.planName],
    ['plan_id', i.planId],
    ['plan_data_version', String(i.dataVersion)],
    ['exported_at', i.exportedAt],
  ];
  if (i.roadLayer) out.push(['road_layer', i.roadLayer.name], ['road_layer_source_file', i.roadLayer.sourceFileName ?? '']);
  if (i.run) {
    const p = i.run.parameters;
    out.push(
      ['run_id', i.run.id],
      ['run_finished_at', i.run.finishedAt ?? ''],
      ['scenario', i.run.scenarioName ?? 'none (the plan as it stands)'],
      ['horizon_minutes', String(p.horizonMinutes)],
      ['time_step_seconds', String(p.timeStepSeconds)],
      ['capacity_factor', String(p.capacityFactor)],
      ['algorithm', p.algorithm],
      ['engine_version', i.run.engineVersion ?? ''],
    );
  }
  for (const [n, note] of (i.notes ?? []).entries()) out.push([`note_${n + 1}`, note]);
  return out;
}

/** The same as lines of text ("key: value"), for CSV comments and KML descriptions. */
export function identityLines(i: ExportIdentity): string[] {
  return identityEntries(i).map(([k, v]) => `${k}: ${v}`);
}

/** The same as an object, for a GeoJSON member. */
export function identityObject(i: ExportIdentity): Record<string, string> {
  return Object.fromEntries(identityEntries(i));
}
