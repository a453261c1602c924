CREATE TYPE "public"."budget_item_kind" AS ENUM('startup', 'milestone', 'visit', 'screen_failure');--> statement-breakpoint
CREATE TYPE "public"."milestone_kind" AS ENUM('site_activated', 'first_implant', 'nth_enrolled', 'close_out');--> statement-breakpoint
CREATE TYPE "public"."payment_cycle" AS ENUM('monthly', 'quarterly');--> statement-breakpoint
CREATE TYPE "public"."payment_trigger" AS ENUM('visit_completed', 'data_entered', 'monitor_verified');--> statement-breakpoint
CREATE TABLE "budget_items" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"budget_version_id" uuid NOT NULL,
	"kind" "budget_item_kind" NOT NULL,
	"milestone" "milestone_kind",
	"n" integer,
	"visit_code" text,
	"amount_minor" bigint NOT NULL,
	CONSTRAINT "budget_items_amount_check" CHECK ("budget_items"."amount_minor" >= 0)
);
--> statement-breakpoint
CREATE TABLE "budget_versions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"budget_id" uuid NOT NULL,
	"site_id" uuid NOT NULL,
	"version_number" integer NOT NULL,
	"effective_from" date NOT NULL,
	"protocol_version_id" uuid,
	"reason" text DEFAULT '' NOT NULL,
	"screen_failure_cap_per_enrolled" integer,
	"screen_failure_cap_max" integer,
	"overhead_bps" integer NOT NULL,
	"holdback_bps" integer NOT NULL,
	"cycle" "payment_cycle" NOT NULL,
	"net_days" integer NOT NULL,
	"trigger" "payment_trigger" NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "budget_versions_rates_check" CHECK ("budget_versions"."overhead_bps" between 0 and 100000 and "budget_versions"."holdback_bps" between 0 and 10000 and "budget_versions"."net_days" between 0 and 365)
);
--> statement-breakpoint
CREATE TABLE "exchange_rates" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"study_id" uuid NOT NULL,
	"currency" text NOT NULL,
	"reporting_currency" text NOT NULL,
	"rate" text NOT NULL,
	"rate_date" date NOT NULL,
	"source" text DEFAULT '' NOT NULL,
	"entered_by" uuid,
	"entered_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "pass_through_invoices" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"study_id" uuid NOT NULL,
	"site_id" uuid NOT NULL,
	"document_id" uuid,
	"description" text NOT NULL,
	"amount_minor" bigint NOT NULL,
	"approved_on" date NOT NULL,
	"approved_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "pass_through_invoices_amount_check" CHECK ("pass_through_invoices"."amount_minor" >= 0)
);
--> statement-breakpoint
CREATE TABLE "payments_recorded" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"study_id" uuid NOT NULL,
	"site_id" uuid NOT NULL,
	"line_key" text NOT NULL,
	"amount_minor" bigint NOT NULL,
	"paid_on" date NOT NULL,
	"reference" text DEFAULT '' NOT NULL,
	"recorded_by" uuid,
	"recorded_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "payments_recorded_amount_check" CHECK ("payments_recorded"."amount_minor" > 0)
);
--> statement-breakpoint
CREATE TABLE "site_budgets" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"study_id" uuid NOT NULL,
	"site_id" uuid NOT NULL,
	"currency" text NOT NULL,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "budget_items" ADD CONSTRAINT "budget_items_budget_version_id_budget_versions_id_fk" FOREIGN KEY ("budget_version_id") REFERENCES "public"."budget_versions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "budget_versions" ADD CONSTRAINT "budget_versions_budget_id_site_budgets_id_fk" FOREIGN KEY ("budget_id") REFERENCES "public"."site_budgets"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "budget_versions" ADD CONSTRAINT "budget_versions_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "budget_versions" ADD CONSTRAINT "budget_versions_protocol_version_id_protocol_versions_id_fk" FOREIGN KEY ("protocol_version_id") REFERENCES "public"."protocol_versions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "budget_versions" ADD CONSTRAINT "budget_versions_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "exchange_rates" ADD CONSTRAINT "exchange_rates_study_id_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."studies"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "exchange_rates" ADD CONSTRAINT "exchange_rates_entered_by_users_id_fk" FOREIGN KEY ("entered_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "pass_through_invoices" ADD CONSTRAINT "pass_through_invoices_study_id_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."studies"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "pass_through_invoices" ADD CONSTRAINT "pass_through_invoices_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "pass_through_invoices" ADD CONSTRAINT "pass_through_invoices_document_id_documents_id_fk" FOREIGN KEY ("document_id") REFERENCES "public"."documents"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "pass_through_invoices" ADD CONSTRAINT "pass_through_invoices_approved_by_users_id_fk" FOREIGN KEY ("approved_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payments_recorded" ADD CONSTRAINT "payments_recorded_study_id_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."studies"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payments_recorded" ADD CONSTRAINT "payments_recorded_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payments_recorded" ADD CONSTRAINT "payments_recorded_recorded_by_users_id_fk" FOREIGN KEY ("recorded_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "site_budgets" ADD CONSTRAINT "site_budgets_study_id_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."studies"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "site_budgets" ADD CONSTRAINT "site_budgets_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "site_budgets" ADD CONSTRAINT "site_budgets_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "budget_items_version_idx" ON "budget_items" USING btree ("budget_version_id");--> statement-breakpoint
CREATE UNIQUE INDEX "budget_items_version_visit_key" ON "budget_items" USING btree ("budget_version_id","visit_code");--> statement-breakpoint
CREATE UNIQUE INDEX "budget_versions_budget_number_key" ON "budget_versions" USING btree ("budget_id","version_number");--> statement-breakpoint
CREATE UNIQUE INDEX "budget_versions_budget_effective_key" ON "budget_versions" USING btree ("budget_id","effective_from");--> statement-breakpoint
CREATE INDEX "budget_versions_site_idx" ON "budget_versions" USING btree ("site_id");--> statement-breakpoint
CREATE UNIQUE INDEX "exchange_rates_study_pair_date_key" ON "exchange_rates" USING btree ("study_id","currency","reporting_currency","rate_date");--> statement-breakpoint
CREATE INDEX "pass_through_invoices_site_idx" ON "pass_through_invoices" USING btree ("site_id");--> statement-breakpoint
CREATE INDEX "payments_recorded_site_idx" ON "payments_recorded" USING btree ("site_id");--> statement-breakpoint
CREATE INDEX "payments_recorded_study_idx" ON "payments_recorded" USING btree ("study_id");--> statement-breakpoint
CREATE UNIQUE INDEX "site_budgets_site_key" ON "site_budgets" USING btree ("site_id");--> statement-breakpoint
CREATE INDEX "site_budgets_study_idx" ON "site_budgets" USING btree ("study_id");