CREATE TABLE "run_road_results" (
	"run_id" uuid NOT NULL,
	"segment_id" bigint NOT NULL,
	"flow_forward" real NOT NULL,
	"flow_backward" real NOT NULL,
	"capacity_forward" real,
	"capacity_backward" real,
	"utilisation" real NOT NULL,
	"cut_forward" boolean NOT NULL,
	"cut_backward" boolean NOT NULL,
	"share_of_cut" real NOT NULL,
	"limiting_minutes" real NOT NULL,
	CONSTRAINT "run_road_results_run_id_segment_id_pk" PRIMARY KEY("run_id","segment_id")
);
--> statement-breakpoint
ALTER TABLE "run_road_results" ADD CONSTRAINT "run_road_results_run_id_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."runs"("id") ON DELETE cascade ON UPDATE no action;
--> statement-breakpoint
-- Results stored with every directed arc in the result move their arcs here, one row per road;
-- a road's share of the cut and time in it come from the result's choke points.
INSERT INTO "run_road_results" ("run_id", "segment_id", "flow_forward", "flow_backward", "capacity_forward", "capacity_backward",
                                "utilisation", "cut_forward", "cut_backward", "share_of_cut", "limiting_minutes")
SELECT r."id", (a->>'segmentId')::bigint,
       coalesce(max((a->>'flowVehiclesPerHour')::real) FILTER (WHERE a->>'direction' = 'forward'), 0),
       coalesce(max((a->>'flowVehiclesPerHour')::real) FILTER (WHERE a->>'direction' = 'backward'), 0),
       max((a->>'capacityVehiclesPerHour')::real) FILTER (WHERE a->>'direction' = 'forward'),
       max((a->>'capacityVehiclesPerHour')::real) FILTER (WHERE a->>'direction' = 'backward'),
       coalesce(max((a->>'utilisation')::real), 0),
       coalesce(bool_or((a->>'inStaticCut')::boolean) FILTER (WHERE a->>'direction' = 'forward'), false),
       coalesce(bool_or((a->>'inStaticCut')::boolean) FILTER (WHERE a->>'direction' = 'backward'), false),
       0, 0
FROM "runs" r CROSS JOIN LATERAL jsonb_array_elements(r."result"->'arcs') a
WHERE jsonb_typeof(r."result"->'arcs') = 'array'
GROUP BY r."id", (a->>'segmentId')::bigint;
--> statement-breakpoint
UPDATE "run_road_results" rr SET "share_of_cut" = c.share, "limiting_minutes" = c.minutes
FROM (
  SELECT r."id" AS run_id, (b->>'segmentId')::bigint AS segment_id, sum((b->>'shareOfCut')::real) AS share,
         max((SELECT coalesce(sum((w->>1)::real - (w->>0)::real), 0) FROM jsonb_array_elements(b->'cutWindows') w)) AS minutes
  FROM "runs" r CROSS JOIN LATERAL jsonb_array_elements(r."result"->'bottlenecks') b
  WHERE jsonb_typeof(r."result"->'arcs') = 'array'
  GROUP BY r."id", (b->>'segmentId')::bigint
) c
WHERE rr."run_id" = c.run_id AND rr."segment_id" = c.segment_id;
--> statement-breakpoint
UPDATE "runs" SET "result" = "result" - 'arcs' WHERE jsonb_typeof("result"->'arcs') = 'array';
