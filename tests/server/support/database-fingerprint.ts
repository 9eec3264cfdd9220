// What a refused request must leave exactly as it was: every table an API route writes, read
// in one query. Runs are compared by number and by which are cancelled only, because queued
// runs move on in the background (the worker's progress is not the request's doing); large
// columns (PDFs, run results, briefing content) by the rows that carry them.
import type pg from 'pg';

const rowsOf = (table: string, order: string, columns = 't::text') =>
  `(SELECT md5(coalesce(string_agg(${columns}, '|' ORDER BY ${order}), '')) FROM ${table} t) AS ${table}`;

const fingerprintQuery = `SELECT
  (SELECT count(*) FROM audit_events) AS audit_events,
  (SELECT count(*) FROM mail_messages) AS mail_messages,
  ${rowsOf('organizations', 't.id')},
  ${rowsOf('users', 't.id')},
  ${rowsOf('memberships', 't.user_id, t.organization_id')},
  ${rowsOf('plans', 't.id')},
  ${rowsOf('road_layers', 't.id', "t.id || ':' || t.plan_id || ':' || t.active")},
  (SELECT count(*) || ':' || coalesce(max(updated_at)::text, '') FROM road_segments) AS road_segments,
  ${rowsOf('capacity_tables', 't.plan_id')},
  ${rowsOf('zones', 't.id')},
  ${rowsOf('shelters', 't.id')},
  ${rowsOf('scenarios', 't.id')},
  (SELECT count(*) || ':' || coalesce(string_agg(id::text, ',' ORDER BY id) FILTER (WHERE status = 'cancelled'), '') FROM runs) AS runs,
  ${rowsOf('batches', 't.id')},
  ${rowsOf('briefings', 't.id', "t.id || ':' || t.status || ':' || t.title || ':' || t.updated_at")},
  (SELECT count(*) FROM briefing_files) AS briefing_files,
  ${rowsOf('briefing_reviews', 't.briefing_id, t.reviewer_user_id')},
  (SELECT count(*) FROM briefing_status_changes) AS briefing_status_changes,
  ${rowsOf('briefing_distributions', 't.id')},
  (SELECT count(*) FROM organization_signing_keys) AS organization_signing_keys,
  ${rowsOf('app_settings', 't.key')}`;

export async function databaseFingerprint(pool: pg.Pool): Promise<Record<string, string>> {
  const { rows } = await pool.query<Record<string, string>>(fingerprintQuery);
  return rows[0]!;
}
