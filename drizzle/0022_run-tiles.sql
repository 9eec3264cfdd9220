CREATE TABLE "run_tiles" (
	"run_id" uuid NOT NULL,
	"data_version" integer NOT NULL,
	"layer_id" integer NOT NULL,
	"z" integer NOT NULL,
	"x" integer NOT NULL,
	"y" integer NOT NULL,
	"tile" "bytea" NOT NULL,
	CONSTRAINT "run_tiles_run_id_data_version_layer_id_z_x_y_pk" PRIMARY KEY("run_id","data_version","layer_id","z","x","y")
);
--> statement-breakpoint
ALTER TABLE "run_tiles" ADD CONSTRAINT "run_tiles_run_id_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."runs"("id") ON DELETE cascade ON UPDATE no action;