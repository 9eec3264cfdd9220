CREATE TYPE "public"."briefing_file_kind" AS ENUM('draft', 'signed');--> statement-breakpoint
CREATE TYPE "public"."briefing_status" AS ENUM('draft', 'awaiting-sign-off', 'signed', 'returned');--> statement-breakpoint
CREATE TYPE "public"."briefing_review_decision" AS ENUM('pending', 'signed', 'returned', 'withdrawn');--> statement-breakpoint
CREATE TYPE "public"."signing_key_source" AS ENUM('generated', 'configured');--> statement-breakpoint
CREATE TABLE "briefing_distributions" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"briefing_id" uuid NOT NULL,
	"recipient_name" text NOT NULL,
	"recipient_email" text NOT NULL,
	"sent_by" uuid,
	"sent_at" timestamp with time zone DEFAULT now() NOT NULL,
	"message_id" text,
	"error" text
);
--> statement-breakpoint
CREATE TABLE "briefing_files" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"briefing_id" uuid NOT NULL,
	"kind" "briefing_file_kind" NOT NULL,
	"pdf" "bytea" NOT NULL,
	"sha256" text NOT NULL,
	"byte_length" integer NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "briefing_reviews" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"briefing_id" uuid NOT NULL,
	"reviewer_user_id" uuid,
	"reviewer_name" text NOT NULL,
	"requested_by" uuid,
	"requested_at" timestamp with time zone DEFAULT now() NOT NULL,
	"decision" "briefing_review_decision" DEFAULT 'pending' NOT NULL,
	"comment" text,
	"decided_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "briefing_status_changes" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"briefing_id" uuid NOT NULL,
	"from_status" "briefing_status",
	"to_status" "briefing_status" NOT NULL,
	"actor_user_id" uuid,
	"comment" text,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "briefings" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"organization_id" uuid NOT NULL,
	"plan_id" uuid NOT NULL,
	"run_id" uuid NOT NULL,
	"scenario_id" uuid,
	"version" integer DEFAULT 1 NOT NULL,
	"previous_version_id" uuid,
	"title" text NOT NULL,
	"status" "briefing_status" DEFAULT 'draft' NOT NULL,
	"content" jsonb NOT NULL,
	"content_sha256" text NOT NULL,
	"created_by" uuid,
	"signed_by" uuid,
	"signer_name" text,
	"signer_role" text,
	"signed_at" timestamp with time zone,
	"signing_key_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "briefings_signed_has_signature" CHECK (("briefings"."status" = 'signed') = ("briefings"."signed_at" IS NOT NULL AND "briefings"."signer_name" IS NOT NULL AND "briefings"."signing_key_id" IS NOT NULL))
);
--> statement-breakpoint
CREATE TABLE "mail_messages" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"organization_id" uuid,
	"briefing_id" uuid,
	"kind" text,
	"received_at" timestamp with time zone DEFAULT now() NOT NULL,
	"envelope_from" text,
	"envelope_to" text[] NOT NULL,
	"subject" text,
	"from_header" text,
	"to_header" text,
	"text_body" text,
	"html_body" text,
	"attachments" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"raw" "bytea" NOT NULL
);
--> statement-breakpoint
CREATE TABLE "organization_signing_keys" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"organization_id" uuid NOT NULL,
	"source" "signing_key_source" NOT NULL,
	"p12" "bytea",
	"certificate_pem" text NOT NULL,
	"fingerprint_sha256" text NOT NULL,
	"subject" text NOT NULL,
	"serial_number" text NOT NULL,
	"not_before" timestamp with time zone NOT NULL,
	"not_after" timestamp with time zone NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"retired_at" timestamp with time zone,
	CONSTRAINT "organization_signing_keys_fingerprintSha256_unique" UNIQUE("fingerprint_sha256")
);
--> statement-breakpoint
ALTER TABLE "briefing_distributions" ADD CONSTRAINT "briefing_distributions_briefing_id_briefings_id_fk" FOREIGN KEY ("briefing_id") REFERENCES "public"."briefings"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefing_distributions" ADD CONSTRAINT "briefing_distributions_sent_by_users_id_fk" FOREIGN KEY ("sent_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefing_files" ADD CONSTRAINT "briefing_files_briefing_id_briefings_id_fk" FOREIGN KEY ("briefing_id") REFERENCES "public"."briefings"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefing_reviews" ADD CONSTRAINT "briefing_reviews_briefing_id_briefings_id_fk" FOREIGN KEY ("briefing_id") REFERENCES "public"."briefings"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefing_reviews" ADD CONSTRAINT "briefing_reviews_reviewer_user_id_users_id_fk" FOREIGN KEY ("reviewer_user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefing_reviews" ADD CONSTRAINT "briefing_reviews_requested_by_users_id_fk" FOREIGN KEY ("requested_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefing_status_changes" ADD CONSTRAINT "briefing_status_changes_briefing_id_briefings_id_fk" FOREIGN KEY ("briefing_id") REFERENCES "public"."briefings"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefing_status_changes" ADD CONSTRAINT "briefing_status_changes_actor_user_id_users_id_fk" FOREIGN KEY ("actor_user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefings" ADD CONSTRAINT "briefings_organization_id_organizations_id_fk" FOREIGN KEY ("organization_id") REFERENCES "public"."organizations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefings" ADD CONSTRAINT "briefings_plan_id_plans_id_fk" FOREIGN KEY ("plan_id") REFERENCES "public"."plans"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefings" ADD CONSTRAINT "briefings_run_id_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."runs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefings" ADD CONSTRAINT "briefings_previous_version_id_briefings_id_fk" FOREIGN KEY ("previous_version_id") REFERENCES "public"."briefings"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefings" ADD CONSTRAINT "briefings_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefings" ADD CONSTRAINT "briefings_signed_by_users_id_fk" FOREIGN KEY ("signed_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "briefings" ADD CONSTRAINT "briefings_signing_key_id_organization_signing_keys_id_fk" FOREIGN KEY ("signing_key_id") REFERENCES "public"."organization_signing_keys"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "mail_messages" ADD CONSTRAINT "mail_messages_organization_id_organizations_id_fk" FOREIGN KEY ("organization_id") REFERENCES "public"."organizations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "organization_signing_keys" ADD CONSTRAINT "organization_signing_keys_organization_id_organizations_id_fk" FOREIGN KEY ("organization_id") REFERENCES "public"."organizations"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "briefing_distributions_briefing_id_sent_at_index" ON "briefing_distributions" USING btree ("briefing_id","sent_at");--> statement-breakpoint
CREATE INDEX "briefing_files_briefing_id_created_at_index" ON "briefing_files" USING btree ("briefing_id","created_at");--> statement-breakpoint
CREATE INDEX "briefing_files_sha256_index" ON "briefing_files" USING btree ("sha256");--> statement-breakpoint
CREATE UNIQUE INDEX "briefing_files_one_signed" ON "briefing_files" USING btree ("briefing_id") WHERE "briefing_files"."kind" = 'signed';--> statement-breakpoint
CREATE UNIQUE INDEX "briefing_reviews_briefing_id_reviewer_user_id_index" ON "briefing_reviews" USING btree ("briefing_id","reviewer_user_id");--> statement-breakpoint
CREATE INDEX "briefing_reviews_reviewer_user_id_decision_index" ON "briefing_reviews" USING btree ("reviewer_user_id","decision");--> statement-breakpoint
CREATE INDEX "briefing_status_changes_briefing_id_id_index" ON "briefing_status_changes" USING btree ("briefing_id","id");--> statement-breakpoint
CREATE INDEX "briefings_organization_id_created_at_index" ON "briefings" USING btree ("organization_id","created_at");--> statement-breakpoint
CREATE INDEX "briefings_plan_id_index" ON "briefings" USING btree ("plan_id");--> statement-breakpoint
CREATE UNIQUE INDEX "briefings_run_id_version_index" ON "briefings" USING btree ("run_id","version");--> statement-breakpoint
CREATE INDEX "mail_messages_organization_id_received_at_index" ON "mail_messages" USING btree ("organization_id","received_at");--> statement-breakpoint
CREATE INDEX "mail_messages_briefing_id_index" ON "mail_messages" USING btree ("briefing_id");--> statement-breakpoint
CREATE UNIQUE INDEX "organization_signing_keys_one_active" ON "organization_signing_keys" USING btree ("organization_id") WHERE "organization_signing_keys"."retired_at" IS NULL;