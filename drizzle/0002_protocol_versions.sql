CREATE TYPE "public"."protocol_version_state" AS ENUM('draft', 'in_review', 'returned', 'approved', 'released', 'superseded');--> statement-breakpoint
CREATE TABLE "protocol_versions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"study_id" uuid NOT NULL,
	"parent_id" uuid,
	"version_label" text NOT NULL,
	"amendment_number" integer,
	"state" "protocol_version_state" DEFAULT 'draft' NOT NULL,
	"title" text NOT NULL,
	"substantial" boolean,
	"substantial_reason" text,
	"content" jsonb NOT NULL,
	"visit_schedule" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"summary_of_changes" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"review_comments" jsonb DEFAULT '[]'::jsonb NOT NULL,
	"revision" integer DEFAULT 1 NOT NULL,
	"content_hash" text,
	"author_id" uuid NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	"submitted_at" timestamp with time zone,
	"approved_by" uuid,
	"approved_at" timestamp with time zone,
	"released_by" uuid,
	"released_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "site_version_approvals" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"site_id" uuid NOT NULL,
	"version_id" uuid NOT NULL,
	"approved_on" date NOT NULL,
	"letter_document_id" uuid,
	"recorded_by" uuid,
	"recorded_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "protocol_versions" ADD CONSTRAINT "protocol_versions_study_id_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."studies"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "protocol_versions" ADD CONSTRAINT "protocol_versions_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "protocol_versions" ADD CONSTRAINT "protocol_versions_approved_by_users_id_fk" FOREIGN KEY ("approved_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "protocol_versions" ADD CONSTRAINT "protocol_versions_released_by_users_id_fk" FOREIGN KEY ("released_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "site_version_approvals" ADD CONSTRAINT "site_version_approvals_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "site_version_approvals" ADD CONSTRAINT "site_version_approvals_version_id_protocol_versions_id_fk" FOREIGN KEY ("version_id") REFERENCES "public"."protocol_versions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "site_version_approvals" ADD CONSTRAINT "site_version_approvals_letter_document_id_documents_id_fk" FOREIGN KEY ("letter_document_id") REFERENCES "public"."documents"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "site_version_approvals" ADD CONSTRAINT "site_version_approvals_recorded_by_users_id_fk" FOREIGN KEY ("recorded_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "protocol_versions_study_label_key" ON "protocol_versions" USING btree ("study_id","version_label");--> statement-breakpoint
CREATE INDEX "protocol_versions_study_idx" ON "protocol_versions" USING btree ("study_id");--> statement-breakpoint
CREATE UNIQUE INDEX "site_version_approvals_site_version_key" ON "site_version_approvals" USING btree ("site_id","version_id");