CREATE TYPE "public"."import_kind" AS ENUM('road-layer', 'zones', 'shelters');--> statement-breakpoint
CREATE TYPE "public"."import_status" AS ENUM('queued', 'running', 'succeeded', 'failed', 'cancelled');--> statement-breakpoint
CREATE TABLE "imports" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"plan_id" uuid NOT NULL,
	"kind" "import_kind" NOT NULL,
	"status" "import_status" DEFAULT 'queued' NOT NULL,
	"phase" text DEFAULT 'queued' NOT NULL,
	"progress" real DEFAULT 0 NOT NULL,
	"file_name" text NOT NULL,
	"size_bytes" integer NOT NULL,
	"layer_name" text,
	"options" jsonb,
	"bytes" "bytea",
	"failure" jsonb,
	"outcome" jsonb,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"started_at" timestamp with time zone,
	"finished_at" timestamp with time zone
);
--> statement-breakpoint
ALTER TABLE "imports" ADD CONSTRAINT "imports_plan_id_plans_id_fk" FOREIGN KEY ("plan_id") REFERENCES "public"."plans"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "imports" ADD CONSTRAINT "imports_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "imports_plan_id_created_at_index" ON "imports" USING btree ("plan_id","created_at");