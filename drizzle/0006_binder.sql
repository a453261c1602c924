CREATE TABLE "binder_document_types" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"study_id" uuid NOT NULL,
	"code" text NOT NULL,
	"name" text NOT NULL,
	"holder" text NOT NULL,
	"applies_to_roles" "role"[] DEFAULT '{}' NOT NULL,
	"required_from" "site_status",
	"expires" boolean DEFAULT false NOT NULL,
	"validity_months" integer,
	"reference" text DEFAULT '' NOT NULL,
	"sort_order" integer DEFAULT 0 NOT NULL,
	"retired_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "documents" ADD COLUMN "document_type_id" uuid;--> statement-breakpoint
ALTER TABLE "documents" ADD COLUMN "person_id" uuid;--> statement-breakpoint
ALTER TABLE "documents" ADD COLUMN "supersedes_id" uuid;--> statement-breakpoint
ALTER TABLE "documents" ADD COLUMN "issued_on" date;--> statement-breakpoint
ALTER TABLE "documents" ADD COLUMN "expires_on" date;--> statement-breakpoint
ALTER TABLE "documents" ADD COLUMN "review_state" text;--> statement-breakpoint
ALTER TABLE "documents" ADD COLUMN "review_reason" text;--> statement-breakpoint
ALTER TABLE "documents" ADD COLUMN "reviewer_id" uuid;--> statement-breakpoint
ALTER TABLE "documents" ADD COLUMN "reviewed_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "binder_document_types" ADD CONSTRAINT "binder_document_types_study_id_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."studies"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "binder_document_types_study_code_key" ON "binder_document_types" USING btree ("study_id","code");--> statement-breakpoint
CREATE INDEX "binder_document_types_study_idx" ON "binder_document_types" USING btree ("study_id");--> statement-breakpoint
ALTER TABLE "documents" ADD CONSTRAINT "documents_document_type_id_binder_document_types_id_fk" FOREIGN KEY ("document_type_id") REFERENCES "public"."binder_document_types"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "documents" ADD CONSTRAINT "documents_person_id_users_id_fk" FOREIGN KEY ("person_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "documents" ADD CONSTRAINT "documents_supersedes_id_documents_id_fk" FOREIGN KEY ("supersedes_id") REFERENCES "public"."documents"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "documents" ADD CONSTRAINT "documents_reviewer_id_users_id_fk" FOREIGN KEY ("reviewer_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "documents_site_type_idx" ON "documents" USING btree ("site_id","document_type_id");