-- Each organization chooses its unit system and the time zone its times are given in (null: the
-- deployment's BRIEFING_TIME_ZONE). Road speeds become double precision so a speed entered in mph
-- converts back to exactly what was entered.
CREATE TYPE "public"."unit_system" AS ENUM('metric', 'us-customary');--> statement-breakpoint
ALTER TABLE "road_segments" ALTER COLUMN "speed_kmh" SET DATA TYPE double precision;--> statement-breakpoint
ALTER TABLE "organizations" ADD COLUMN "unit_system" "unit_system" DEFAULT 'metric' NOT NULL;--> statement-breakpoint
ALTER TABLE "organizations" ADD COLUMN "time_zone" text;