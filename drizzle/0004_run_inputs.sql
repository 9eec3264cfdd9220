CREATE TABLE "run_inputs" (
	"run_id" uuid PRIMARY KEY NOT NULL,
	"input" jsonb NOT NULL
);
--> statement-breakpoint
ALTER TABLE "run_inputs" ADD CONSTRAINT "run_inputs_run_id_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."runs"("id") ON DELETE cascade ON UPDATE no action;