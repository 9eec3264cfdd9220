-- The ramp (motorway_link) row's capacity source: stored tables that still carry the earlier
-- default text get the new default (shared/model/capacity-defaults.ts), nothing else changes.
-- A text a planner wrote themselves does not start like the earlier default and is kept.
UPDATE "capacity_tables" AS ct
SET "table" = jsonb_set(ct."table", '{rows}', (
    SELECT jsonb_agg(
      CASE
        WHEN r->>'roadClass' = 'motorway_link' AND r->>'capacitySource' LIKE 'ramp capacity 1,450–1,550 veh/h/ln, %'
          THEN jsonb_set(r, '{capacitySource}', to_jsonb('common practice (CP): a single-lane ramp planned below a freeway lane, 1,500 veh/h/ln'::text))
        ELSE r
      END ORDER BY i)
    FROM jsonb_array_elements(ct."table"->'rows') WITH ORDINALITY AS e(r, i)
  )),
  "updated_at" = now()
WHERE EXISTS (
  SELECT 1 FROM jsonb_array_elements(ct."table"->'rows') AS e(r)
  WHERE r->>'roadClass' = 'motorway_link' AND r->>'capacitySource' LIKE 'ramp capacity 1,450–1,550 veh/h/ln, %'
);
