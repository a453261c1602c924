CREATE TYPE "public"."payee_state" AS ENUM('pending', 'verified', 'restricted', 'rejected');--> statement-breakpoint
CREATE TYPE "public"."payment_query_state" AS ENUM('open', 'answered', 'resolved');--> statement-breakpoint
CREATE TYPE "public"."payment_run_state" AS ENUM('prepared', 'approved', 'sending', 'sent', 'cancelled');--> statement-breakpoint
CREATE TYPE "public"."run_line_state" AS ENUM('in_run', 'sent', 'paid', 'failed', 'reversed');--> statement-breakpoint
CREATE TYPE "public"."transfer_state" AS ENUM('queued', 'sending', 'sent', 'paid', 'failed', 'reversed');--> statement-breakpoint
CREATE TABLE "payee_accounts" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"study_id" uuid NOT NULL,
	"site_id" uuid NOT NULL,
	"stripe_account_id" text NOT NULL,
	"state" "payee_state" DEFAULT 'pending' NOT NULL,
	"state_reason" text,
	"created_by" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "payment_confirmations" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"transfer_id" uuid NOT NULL,
	"study_id" uuid NOT NULL,
	"site_id" uuid NOT NULL,
	"received_on" date NOT NULL,
	"amount_minor" bigint NOT NULL,
	"bank_reference" text NOT NULL,
	"confirmed_by" uuid NOT NULL,
	"confirmed_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "payment_queries" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"study_id" uuid NOT NULL,
	"site_id" uuid NOT NULL,
	"transfer_id" uuid,
	"line_key" text,
	"subject" text NOT NULL,
	"state" "payment_query_state" DEFAULT 'open' NOT NULL,
	"raised_by" uuid NOT NULL,
	"raised_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "payment_query_messages" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"query_id" uuid NOT NULL,
	"author_id" uuid NOT NULL,
	"side" text NOT NULL,
	"body" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "payment_query_messages_side_check" CHECK ("payment_query_messages"."side" in ('site', 'sponsor'))
);
--> statement-breakpoint
CREATE TABLE "payment_run_lines" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"run_id" uuid NOT NULL,
	"study_id" uuid NOT NULL,
	"site_id" uuid NOT NULL,
	"currency" text NOT NULL,
	"line_key" text NOT NULL,
	"kind" text NOT NULL,
	"description" text NOT NULL,
	"service_date" date NOT NULL,
	"due_date" date NOT NULL,
	"cycle" text NOT NULL,
	"amount_minor" bigint NOT NULL,
	"state" "run_line_state" DEFAULT 'in_run' NOT NULL,
	"state_reason" text,
	"transfer_id" uuid,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "payment_run_lines_amount_check" CHECK ("payment_run_lines"."amount_minor" > 0)
);
--> statement-breakpoint
CREATE TABLE "payment_runs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"study_id" uuid NOT NULL,
	"number" integer NOT NULL,
	"state" "payment_run_state" DEFAULT 'prepared' NOT NULL,
	"selection" jsonb DEFAULT '{}'::jsonb NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"content_hash" text NOT NULL,
	"line_count" integer NOT NULL,
	"prepared_by" uuid NOT NULL,
	"prepared_at" timestamp with time zone DEFAULT now() NOT NULL,
	"approved_by" uuid,
	"approved_at" timestamp with time zone,
	"send_requested_by" uuid,
	"send_requested_at" timestamp with time zone,
	"cancelled_by" uuid,
	"cancelled_at" timestamp with time zone,
	CONSTRAINT "payment_runs_four_eyes_check" CHECK ("payment_runs"."approved_by" is null or "payment_runs"."approved_by" <> "payment_runs"."prepared_by")
);
--> statement-breakpoint
CREATE TABLE "payment_transfers" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"run_id" uuid NOT NULL,
	"study_id" uuid NOT NULL,
	"site_id" uuid NOT NULL,
	"currency" text NOT NULL,
	"amount_minor" bigint NOT NULL,
	"stripe_amount" bigint NOT NULL,
	"destination_account_id" text NOT NULL,
	"idempotency_key" text NOT NULL,
	"stripe_transfer_id" text,
	"state" "transfer_state" DEFAULT 'queued' NOT NULL,
	"attempts" integer DEFAULT 0 NOT NULL,
	"next_attempt_at" timestamp with time zone DEFAULT now() NOT NULL,
	"lease_until" timestamp with time zone,
	"last_error" text,
	"failure_code" text,
	"failure_message" text,
	"sent_at" timestamp with time zone,
	"paid_at" timestamp with time zone,
	"failed_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "payment_transfers_amount_check" CHECK ("payment_transfers"."amount_minor" > 0 and "payment_transfers"."stripe_amount" > 0)
);
--> statement-breakpoint
CREATE TABLE "stripe_events" (
	"id" text PRIMARY KEY NOT NULL,
	"type" text NOT NULL,
	"stripe_created" bigint NOT NULL,
	"object_id" text,
	"payload" jsonb NOT NULL,
	"received_at" timestamp with time zone DEFAULT now() NOT NULL,
	"outcome" text DEFAULT '' NOT NULL
);
--> statement-breakpoint
ALTER TABLE "payee_accounts" ADD CONSTRAINT "payee_accounts_study_id_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."studies"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payee_accounts" ADD CONSTRAINT "payee_accounts_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payee_accounts" ADD CONSTRAINT "payee_accounts_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment_confirmations" ADD CONSTRAINT "payment_confirmations_transfer_id_payment_transfers_id_fk" FOREIGN KEY ("transfer_id") REFERENCES "public"."payment_transfers"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment_confirmations" ADD CONSTRAINT "payment_confirmations_study_id_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."studies"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment_confirmations" ADD CONSTRAINT "payment_confirmations_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment_confirmations" ADD CONSTRAINT "payment_confirmations_confirmed_by_users_id_fk" FOREIGN KEY ("confirmed_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment_queries" ADD CONSTRAINT "payment_queries_study_id_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."studies"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment_queries" ADD CONSTRAINT "payment_queries_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment_queries" ADD CONSTRAINT "payment_queries_transfer_id_payment_transfers_id_fk" FOREIGN KEY ("transfer_id") REFERENCES "public"."payment_transfers"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment_queries" ADD CONSTRAINT "payment_queries_raised_by_users_id_fk" FOREIGN KEY ("raised_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment_query_messages" ADD CONSTRAINT "payment_query_messages_query_id_payment_queries_id_fk" FOREIGN KEY ("query_id") REFERENCES "public"."payment_queries"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment_query_messages" ADD CONSTRAINT "payment_query_messages_author_id_users_id_fk" FOREIGN KEY ("author_id") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment_run_lines" ADD CONSTRAINT "payment_run_lines_run_id_payment_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."payment_runs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment_run_lines" ADD CONSTRAINT "payment_run_lines_study_id_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."studies"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment_run_lines" ADD CONSTRAINT "payment_run_lines_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment_runs" ADD CONSTRAINT "payment_runs_study_id_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."studies"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment_runs" ADD CONSTRAINT "payment_runs_prepared_by_users_id_fk" FOREIGN KEY ("prepared_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment_runs" ADD CONSTRAINT "payment_runs_approved_by_users_id_fk" FOREIGN KEY ("approved_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment_runs" ADD CONSTRAINT "payment_runs_send_requested_by_users_id_fk" FOREIGN KEY ("send_requested_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment_runs" ADD CONSTRAINT "payment_runs_cancelled_by_users_id_fk" FOREIGN KEY ("cancelled_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment_transfers" ADD CONSTRAINT "payment_transfers_run_id_payment_runs_id_fk" FOREIGN KEY ("run_id") REFERENCES "public"."payment_runs"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment_transfers" ADD CONSTRAINT "payment_transfers_study_id_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."studies"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "payment_transfers" ADD CONSTRAINT "payment_transfers_site_id_sites_id_fk" FOREIGN KEY ("site_id") REFERENCES "public"."sites"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "payee_accounts_site_key" ON "payee_accounts" USING btree ("site_id");--> statement-breakpoint
CREATE UNIQUE INDEX "payee_accounts_stripe_key" ON "payee_accounts" USING btree ("stripe_account_id");--> statement-breakpoint
CREATE UNIQUE INDEX "payment_confirmations_transfer_key" ON "payment_confirmations" USING btree ("transfer_id");--> statement-breakpoint
CREATE INDEX "payment_confirmations_site_idx" ON "payment_confirmations" USING btree ("site_id");--> statement-breakpoint
CREATE INDEX "payment_queries_site_idx" ON "payment_queries" USING btree ("site_id");--> statement-breakpoint
CREATE INDEX "payment_queries_transfer_idx" ON "payment_queries" USING btree ("transfer_id");--> statement-breakpoint
CREATE INDEX "payment_query_messages_query_idx" ON "payment_query_messages" USING btree ("query_id");--> statement-breakpoint
CREATE UNIQUE INDEX "payment_run_lines_run_line_key" ON "payment_run_lines" USING btree ("run_id","line_key");--> statement-breakpoint
CREATE UNIQUE INDEX "payment_run_lines_live_key" ON "payment_run_lines" USING btree ("site_id","line_key") WHERE state in ('in_run', 'sent', 'paid');--> statement-breakpoint
CREATE INDEX "payment_run_lines_site_idx" ON "payment_run_lines" USING btree ("site_id");--> statement-breakpoint
CREATE INDEX "payment_run_lines_transfer_idx" ON "payment_run_lines" USING btree ("transfer_id");--> statement-breakpoint
CREATE UNIQUE INDEX "payment_runs_study_number_key" ON "payment_runs" USING btree ("study_id","number");--> statement-breakpoint
CREATE UNIQUE INDEX "payment_transfers_idempotency_key" ON "payment_transfers" USING btree ("idempotency_key");--> statement-breakpoint
CREATE UNIQUE INDEX "payment_transfers_run_site_currency_key" ON "payment_transfers" USING btree ("run_id","site_id","currency");--> statement-breakpoint
CREATE UNIQUE INDEX "payment_transfers_stripe_key" ON "payment_transfers" USING btree ("stripe_transfer_id");--> statement-breakpoint
CREATE INDEX "payment_transfers_queue_idx" ON "payment_transfers" USING btree ("state","next_attempt_at");--> statement-breakpoint
CREATE INDEX "payment_transfers_site_idx" ON "payment_transfers" USING btree ("site_id");--> statement-breakpoint
CREATE INDEX "stripe_events_object_idx" ON "stripe_events" USING btree ("object_id");