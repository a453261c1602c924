CREATE TABLE "acknowledgement_requests" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"study_id" uuid NOT NULL,
	"site_id" uuid NOT NULL,
	"version_id" uuid NOT NULL,
	"user_id" uuid NOT NULL,
	"reason" text NOT NULL,
	"compare_to_version_id" uuid,
	"requested_at" timestamp with time zone DEFAULT now() NOT NULL,
	"due_on" date NOT NULL
);
--> statement-breakpoint
CREATE TABLE "electronic_signatures" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"request_id" uuid NOT NULL,
	"study_id" uuid NOT NULL,
	"site_id" uuid NOT NULL,
	"version_id" uuid NOT NULL,
	"signer_id" uuid NOT NULL,
	"printed_name" text NOT NULL,
	"signer_email" text NOT NULL,
	"role" "role" NOT NULL,
	"site_code" text NOT NULL,
	"version_label" text NOT NULL,
	"meaning" text NOT NULL,
	"content_hash" text NOT NULL,
	"signed_at" timestamp with time zone NOT NULL,
	"site_time_zone" text NOT NULL,
	"signed_at_site_local" text NOT NULL
);
--> statement-breakpoint
ALTER TABLE "acknowledgement_requests" ADD CONSTRAINT "acknowledgement_requests_study_id_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."studies"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "acknowledgement_requests" ADD CONSTRAINT "acknowledgement_requests_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "acknowledgement_requests" ADD CONSTRAINT "acknowledgement_requests_version_id_protocol_versions_id_fk" FOREIGN KEY ("version_id") REFERENCES "public"."protocol_versions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "acknowledgement_requests" ADD CONSTRAINT "acknowledgement_requests_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "acknowledgement_requests" ADD CONSTRAINT "acknowledgement_requests_compare_to_version_id_protocol_versions_id_fk" FOREIGN KEY ("compare_to_version_id") REFERENCES "public"."protocol_versions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "electronic_signatures" ADD CONSTRAINT "electronic_signatures_request_id_acknowledgement_requests_id_fk" FOREIGN KEY ("request_id") REFERENCES "public"."acknowledgement_requests"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "electronic_signatures" ADD CONSTRAINT "electronic_signatures_study_id_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."studies"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "electronic_signatures" ADD CONSTRAINT "electronic_signatures_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "electronic_signatures" ADD CONSTRAINT "electronic_signatures_version_id_protocol_versions_id_fk" FOREIGN KEY ("version_id") REFERENCES "public"."protocol_versions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "electronic_signatures" ADD CONSTRAINT "electronic_signatures_signer_id_users_id_fk" FOREIGN KEY ("signer_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "acknowledgement_requests_version_site_user_key" ON "acknowledgement_requests" USING btree ("version_id","site_id","user_id");--> statement-breakpoint
CREATE INDEX "acknowledgement_requests_study_site_idx" ON "acknowledgement_requests" USING btree ("study_id","site_id");--> statement-breakpoint
CREATE INDEX "acknowledgement_requests_user_idx" ON "acknowledgement_requests" USING btree ("user_id");--> statement-breakpoint
CREATE UNIQUE INDEX "electronic_signatures_version_signer_site_key" ON "electronic_signatures" USING btree ("version_id","signer_id","site_id");--> statement-breakpoint
CREATE UNIQUE INDEX "electronic_signatures_request_key" ON "electronic_signatures" USING btree ("request_id");--> statement-breakpoint
CREATE INDEX "electronic_signatures_study_site_idx" ON "electronic_signatures" USING btree ("study_id","site_id");