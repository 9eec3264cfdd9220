CREATE TYPE "public"."run_status" AS ENUM('queued', 'running', 'succeeded', 'failed', 'cancelled');--> statement-breakpoint
CREATE TABLE "capacity_tables" (
	"plan_id" uuid PRIMARY KEY NOT NULL,
	"table" jsonb NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "road_layers" (
	"id" serial PRIMARY KEY NOT NULL,
	"plan_id" uuid NOT NULL,
	"name" text NOT NULL,
	"source_file_name" text NOT NULL,
	"import_options" jsonb NOT NULL,
	"report" jsonb NOT NULL,
	"active" boolean DEFAULT true NOT NULL,
	"node_count" integer NOT NULL,
	"segment_count" integer NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "road_nodes" (
	"layer_id" integer NOT NULL,
	"node_index" integer NOT NULL,
	"lon" double precision NOT NULL,
	"lat" double precision NOT NULL,
	CONSTRAINT "road_nodes_layer_id_node_index_pk" PRIMARY KEY("layer_id","node_index")
);
--> statement-breakpoint
CREATE TABLE "road_segments" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"layer_id" integer NOT NULL,
	"from_node" integer NOT NULL,
	"to_node" integer NOT NULL,
	"road_class" text NOT NULL,
	"lanes_forward" integer,
	"lanes_backward" integer,
	"oneway" boolean NOT NULL,
	"speed_kmh" real,
	"name" text,
	"bridge" boolean NOT NULL,
	"tunnel" boolean NOT NULL,
	"layer" integer NOT NULL,
	"closed" boolean DEFAULT false NOT NULL,
	"capacity_override_veh_per_hour_per_lane" real,
	"length_meters" double precision NOT NULL,
	"component" integer NOT NULL,
	"source_feature_index" integer NOT NULL,
	"source_id" text,
	"geom" geometry(LineString,4326) NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "shelters" (
	"id" serial PRIMARY KEY NOT NULL,
	"plan_id" uuid NOT NULL,
	"name" text NOT NULL,
	"capacity_persons" integer,
	"lon" double precision NOT NULL,
	"lat" double precision NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "zones" (
	"id" serial PRIMARY KEY NOT NULL,
	"plan_id" uuid NOT NULL,
	"name" text NOT NULL,
	"population" integer NOT NULL,
	"participation_rate" real NOT NULL,
	"persons_per_vehicle" real NOT NULL,
	"departure_curve" jsonb NOT NULL,
	"geometry" jsonb NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "runs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"plan_id" uuid NOT NULL,
	"scenario_id" uuid,
	"status" "run_status" DEFAULT 'queued' NOT NULL,
	"phase" text DEFAULT 'queued' NOT NULL,
	"progress" real DEFAULT 0 NOT NULL,
	"parameters" jsonb NOT NULL,
	"data_version" integer NOT NULL,
	"road_layer_id" integer,
	"input_hash" text NOT NULL,
	"result" jsonb,
	"failure_reason" text,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"started_at" timestamp with time zone,
	"finished_at" timestamp with time zone
);
--> statement-breakpoint
ALTER TABLE "plans" ADD COLUMN "data_version" integer DEFAULT 0 NOT NULL;--> statement-breakpoint
ALTER TABLE "capacity_tables" ADD CONSTRAINT "capacity_tables_plan_id_plans_id_fk" FOREIGN KEY ("plan_id") REFERENCES "public"."plans"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "road_layers" ADD CONSTRAINT "road_layers_plan_id_plans_id_fk" FOREIGN KEY ("plan_id") REFERENCES "public"."plans"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "road_layers" ADD CONSTRAINT "road_layers_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "road_nodes" ADD CONSTRAINT "road_nodes_layer_id_road_layers_id_fk" FOREIGN KEY ("layer_id") REFERENCES "public"."road_layers"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "road_segments" ADD CONSTRAINT "road_segments_layer_id_road_layers_id_fk" FOREIGN KEY ("layer_id") REFERENCES "public"."road_layers"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "shelters" ADD CONSTRAINT "shelters_plan_id_plans_id_fk" FOREIGN KEY ("plan_id") REFERENCES "public"."plans"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "zones" ADD CONSTRAINT "zones_plan_id_plans_id_fk" FOREIGN KEY ("plan_id") REFERENCES "public"."plans"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "runs" ADD CONSTRAINT "runs_plan_id_plans_id_fk" FOREIGN KEY ("plan_id") REFERENCES "public"."plans"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "runs" ADD CONSTRAINT "runs_road_layer_id_road_layers_id_fk" FOREIGN KEY ("road_layer_id") REFERENCES "public"."road_layers"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "runs" ADD CONSTRAINT "runs_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "road_layers_plan_id_active_index" ON "road_layers" USING btree ("plan_id","active");--> statement-breakpoint
CREATE INDEX "road_segments_layer_id_id_index" ON "road_segments" USING btree ("layer_id","id");--> statement-breakpoint
CREATE INDEX "road_segments_layer_id_road_class_index" ON "road_segments" USING btree ("layer_id","road_class");--> statement-breakpoint
CREATE INDEX "road_segments_geom_idx" ON "road_segments" USING gist ("geom");--> statement-breakpoint
CREATE INDEX "shelters_plan_id_index" ON "shelters" USING btree ("plan_id");--> statement-breakpoint
CREATE INDEX "zones_plan_id_index" ON "zones" USING btree ("plan_id");--> statement-breakpoint
CREATE INDEX "runs_plan_id_created_at_index" ON "runs" USING btree ("plan_id","created_at");--> statement-breakpoint
CREATE INDEX "runs_plan_id_input_hash_index" ON "runs" USING btree ("plan_id","input_hash");