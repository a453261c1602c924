CREATE TYPE "public"."deviation_source" AS ENUM('automatic', 'manual');--> statement-breakpoint
CREATE TYPE "public"."deviation_status" AS ENUM('open', 'resolved');--> statement-breakpoint
CREATE TYPE "public"."subject_status" AS ENUM('screening', 'screen_failed', 'enrolled', 'implanted', 'follow_up', 'completed', 'withdrawn');--> statement-breakpoint
CREATE TYPE "public"."visit_outcome" AS ENUM('done', 'missed');--> statement-breakpoint
CREATE TABLE "calendar_feed_tokens" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"user_id" uuid NOT NULL,
	"study_id" uuid NOT NULL,
	"site_id" uuid NOT NULL,
	"token_hash" text NOT NULL,
	"label" text DEFAULT '' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"last_used_at" timestamp with time zone,
	"revoked_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "deviations" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"study_id" uuid NOT NULL,
	"site_id" uuid NOT NULL,
	"subject_id" uuid NOT NULL,
	"source" "deviation_source" NOT NULL,
	"key" text,
	"category" text NOT NULL,
	"visit_code" text,
	"version_id" uuid,
	"occurred_on" date NOT NULL,
	"window_start" date,
	"window_end" date,
	"days_outside" integer,
	"description" text NOT NULL,
	"status" "deviation_status" DEFAULT 'open' NOT NULL,
	"resolved_at" timestamp with time zone,
	"resolution" text,
	"reported_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "subject_status_events" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"subject_id" uuid NOT NULL,
	"from_status" "subject_status",
	"to_status" "subject_status" NOT NULL,
	"effective_on" date NOT NULL,
	"reason" text,
	"actor_id" uuid,
	"at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "subjects" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"study_id" uuid NOT NULL,
	"site_id" uuid NOT NULL,
	"code" text NOT NULL,
	"status" "subject_status" DEFAULT 'screening' NOT NULL,
	"consent_date" date NOT NULL,
	"consent_version_id" uuid NOT NULL,
	"screening_date" date,
	"enrolment_date" date,
	"implant_date" date,
	"device_serial" text,
	"screen_fail_reason" text,
	"withdrawn_reason" text,
	"ended_on" date,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "visit_records" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"subject_id" uuid NOT NULL,
	"visit_code" text NOT NULL,
	"version_id" uuid NOT NULL,
	"outcome" "visit_outcome" NOT NULL,
	"actual_date" date,
	"data_entered_on" date,
	"verified_on" date,
	"verified_by" uuid,
	"recorded_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "calendar_feed_tokens" ADD CONSTRAINT "calendar_feed_tokens_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calendar_feed_tokens" ADD CONSTRAINT "calendar_feed_tokens_study_id_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."studies"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "calendar_feed_tokens" ADD CONSTRAINT "calendar_feed_tokens_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "deviations" ADD CONSTRAINT "deviations_study_id_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."studies"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "deviations" ADD CONSTRAINT "deviations_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "deviations" ADD CONSTRAINT "deviations_subject_id_subjects_id_fk" FOREIGN KEY ("subject_id") REFERENCES "public"."subjects"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "deviations" ADD CONSTRAINT "deviations_version_id_protocol_versions_id_fk" FOREIGN KEY ("version_id") REFERENCES "public"."protocol_versions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "deviations" ADD CONSTRAINT "deviations_reported_by_users_id_fk" FOREIGN KEY ("reported_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "subject_status_events" ADD CONSTRAINT "subject_status_events_subject_id_subjects_id_fk" FOREIGN KEY ("subject_id") REFERENCES "public"."subjects"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "subject_status_events" ADD CONSTRAINT "subject_status_events_actor_id_users_id_fk" FOREIGN KEY ("actor_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "subjects" ADD CONSTRAINT "subjects_study_id_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."studies"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "subjects" ADD CONSTRAINT "subjects_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "subjects" ADD CONSTRAINT "subjects_consent_version_id_protocol_versions_id_fk" FOREIGN KEY ("consent_version_id") REFERENCES "public"."protocol_versions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "subjects" ADD CONSTRAINT "subjects_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visit_records" ADD CONSTRAINT "visit_records_subject_id_subjects_id_fk" FOREIGN KEY ("subject_id") REFERENCES "public"."subjects"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visit_records" ADD CONSTRAINT "visit_records_version_id_protocol_versions_id_fk" FOREIGN KEY ("version_id") REFERENCES "public"."protocol_versions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visit_records" ADD CONSTRAINT "visit_records_verified_by_users_id_fk" FOREIGN KEY ("verified_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "visit_records" ADD CONSTRAINT "visit_records_recorded_by_users_id_fk" FOREIGN KEY ("recorded_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "calendar_feed_tokens_hash_key" ON "calendar_feed_tokens" USING btree ("token_hash");--> statement-breakpoint
CREATE INDEX "calendar_feed_tokens_user_idx" ON "calendar_feed_tokens" USING btree ("user_id","site_id");--> statement-breakpoint
CREATE UNIQUE INDEX "deviations_open_key" ON "deviations" USING btree ("key") WHERE status = 'open' and key is not null;--> statement-breakpoint
CREATE INDEX "deviations_study_idx" ON "deviations" USING btree ("study_id","occurred_on");--> statement-breakpoint
CREATE INDEX "deviations_subject_idx" ON "deviations" USING btree ("subject_id");--> statement-breakpoint
CREATE INDEX "subject_status_events_subject_idx" ON "subject_status_events" USING btree ("subject_id");--> statement-breakpoint
CREATE UNIQUE INDEX "subjects_study_code_key" ON "subjects" USING btree ("study_id","code");--> statement-breakpoint
CREATE INDEX "subjects_site_idx" ON "subjects" USING btree ("site_id");--> statement-breakpoint
CREATE UNIQUE INDEX "visit_records_subject_visit_key" ON "visit_records" USING btree ("subject_id","visit_code");