-- Settings become per organization: an installation-wide value is copied to every organization,
-- so each keeps what it saw, and from now on each administrator changes only their own.
ALTER TABLE "app_settings" DROP CONSTRAINT "app_settings_pkey";--> statement-breakpoint
ALTER TABLE "app_settings" ADD COLUMN "organization_id" uuid;--> statement-breakpoint
INSERT INTO "app_settings" ("organization_id", "key", "value", "updated_at")
  SELECT o."id", s."key", s."value", s."updated_at" FROM "organizations" o CROSS JOIN "app_settings" s WHERE s."organization_id" IS NULL;--> statement-breakpoint
DELETE FROM "app_settings" WHERE "organization_id" IS NULL;--> statement-breakpoint
ALTER TABLE "app_settings" ALTER COLUMN "organization_id" SET NOT NULL;--> statement-breakpoint
ALTER TABLE "app_settings" ADD CONSTRAINT "app_settings_organization_id_key_pk" PRIMARY KEY("organization_id","key");--> statement-breakpoint
ALTER TABLE "app_settings" ADD CONSTRAINT "app_settings_organization_id_organizations_id_fk" FOREIGN KEY ("organization_id") REFERENCES "public"."organizations"("id") ON DELETE cascade ON UPDATE no action;
