CREATE TYPE "public"."export_status" AS ENUM('queued', 'running', 'done', 'failed', 'cancelled');--> statement-breakpoint
CREATE TYPE "public"."signing_meaning" AS ENUM('authored', 'witnessed', 'reviewed');--> statement-breakpoint
CREATE TABLE "api_tokens" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"name" text NOT NULL,
	"token_hash" text NOT NULL,
	"prefix" text NOT NULL,
	"scopes" text[] NOT NULL,
	"created_by" uuid NOT NULL,
	"acts_for" uuid NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"last_used_at" timestamp with time zone,
	"revoked_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "attachments" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"entry_id" uuid NOT NULL,
	"name" text NOT NULL,
	"storage_key" text NOT NULL,
	"media_type" text NOT NULL,
	"size" integer NOT NULL,
	"sha256" text NOT NULL,
	"uploaded_by" uuid NOT NULL,
	"uploaded_at" timestamp with time zone DEFAULT now() NOT NULL,
	"detached_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "entry_versions" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"entry_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"supersedes_version" integer,
	"title" text NOT NULL,
	"content" jsonb NOT NULL,
	"record" jsonb NOT NULL,
	"record_hash" text NOT NULL,
	"frozen_at" timestamp with time zone NOT NULL,
	"frozen_by" uuid NOT NULL
);
--> statement-breakpoint
CREATE TABLE "export_jobs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"requested_by" uuid NOT NULL,
	"parameters" jsonb NOT NULL,
	"status" "export_status" DEFAULT 'queued' NOT NULL,
	"total" integer DEFAULT 0 NOT NULL,
	"done" integer DEFAULT 0 NOT NULL,
	"storage_key" text,
	"error" text,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"started_at" timestamp with time zone,
	"finished_at" timestamp with time zone,
	"heartbeat_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "signatures" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"entry_version_id" uuid NOT NULL,
	"signer_id" uuid NOT NULL,
	"key_id" uuid NOT NULL,
	"meaning" "signing_meaning" NOT NULL,
	"statement" jsonb NOT NULL,
	"statement_hash" text NOT NULL,
	"signature" text NOT NULL,
	"signed_at" timestamp with time zone NOT NULL,
	"countersigns_id" uuid
);
--> statement-breakpoint
CREATE TABLE "signing_challenges" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"nonce" text NOT NULL,
	"person_id" uuid NOT NULL,
	"entry_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"meaning" "signing_meaning" NOT NULL,
	"record_hash" text NOT NULL,
	"issued_at" timestamp with time zone NOT NULL,
	"expires_at" timestamp with time zone NOT NULL,
	"used_at" timestamp with time zone
);
--> statement-breakpoint
CREATE TABLE "signing_keys" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"person_id" uuid NOT NULL,
	"public_key" text NOT NULL,
	"fingerprint" text NOT NULL,
	"sealed_secret_key" jsonb NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"retired_at" timestamp with time zone,
	"retired_reason" text
);
--> statement-breakpoint
CREATE TABLE "witness_requests" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"entry_id" uuid NOT NULL,
	"version" integer NOT NULL,
	"requested_by" uuid NOT NULL,
	"witness_id" uuid NOT NULL,
	"requested_at" timestamp with time zone DEFAULT now() NOT NULL,
	"resolved_at" timestamp with time zone,
	"outcome" text,
	"reason" text
);
--> statement-breakpoint
ALTER TABLE "api_tokens" ADD CONSTRAINT "api_tokens_created_by_people_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."people"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "api_tokens" ADD CONSTRAINT "api_tokens_acts_for_people_id_fk" FOREIGN KEY ("acts_for") REFERENCES "public"."people"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "attachments" ADD CONSTRAINT "attachments_entry_id_entries_id_fk" FOREIGN KEY ("entry_id") REFERENCES "public"."entries"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "attachments" ADD CONSTRAINT "attachments_uploaded_by_people_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."people"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "entry_versions" ADD CONSTRAINT "entry_versions_entry_id_entries_id_fk" FOREIGN KEY ("entry_id") REFERENCES "public"."entries"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "entry_versions" ADD CONSTRAINT "entry_versions_frozen_by_people_id_fk" FOREIGN KEY ("frozen_by") REFERENCES "public"."people"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "export_jobs" ADD CONSTRAINT "export_jobs_requested_by_people_id_fk" FOREIGN KEY ("requested_by") REFERENCES "public"."people"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "signatures" ADD CONSTRAINT "signatures_entry_version_id_entry_versions_id_fk" FOREIGN KEY ("entry_version_id") REFERENCES "public"."entry_versions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "signatures" ADD CONSTRAINT "signatures_signer_id_people_id_fk" FOREIGN KEY ("signer_id") REFERENCES "public"."people"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "signatures" ADD CONSTRAINT "signatures_key_id_signing_keys_id_fk" FOREIGN KEY ("key_id") REFERENCES "public"."signing_keys"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "signing_challenges" ADD CONSTRAINT "signing_challenges_person_id_people_id_fk" FOREIGN KEY ("person_id") REFERENCES "public"."people"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "signing_challenges" ADD CONSTRAINT "signing_challenges_entry_id_entries_id_fk" FOREIGN KEY ("entry_id") REFERENCES "public"."entries"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "signing_keys" ADD CONSTRAINT "signing_keys_person_id_people_id_fk" FOREIGN KEY ("person_id") REFERENCES "public"."people"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "witness_requests" ADD CONSTRAINT "witness_requests_entry_id_entries_id_fk" FOREIGN KEY ("entry_id") REFERENCES "public"."entries"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "witness_requests" ADD CONSTRAINT "witness_requests_requested_by_people_id_fk" FOREIGN KEY ("requested_by") REFERENCES "public"."people"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "witness_requests" ADD CONSTRAINT "witness_requests_witness_id_people_id_fk" FOREIGN KEY ("witness_id") REFERENCES "public"."people"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "api_tokens_hash" ON "api_tokens" USING btree ("token_hash");--> statement-breakpoint
CREATE INDEX "attachments_entry" ON "attachments" USING btree ("entry_id");--> statement-breakpoint
CREATE UNIQUE INDEX "entry_versions_entry_version" ON "entry_versions" USING btree ("entry_id","version");--> statement-breakpoint
CREATE INDEX "entry_versions_frozen" ON "entry_versions" USING btree ("frozen_at");--> statement-breakpoint
CREATE INDEX "export_jobs_status" ON "export_jobs" USING btree ("status");--> statement-breakpoint
CREATE INDEX "signatures_version" ON "signatures" USING btree ("entry_version_id");--> statement-breakpoint
CREATE INDEX "signatures_signer" ON "signatures" USING btree ("signer_id");--> statement-breakpoint
CREATE UNIQUE INDEX "signatures_one_author" ON "signatures" USING btree ("entry_version_id") WHERE meaning = 'authored';--> statement-breakpoint
CREATE UNIQUE INDEX "signatures_one_witness" ON "signatures" USING btree ("entry_version_id") WHERE meaning = 'witnessed';--> statement-breakpoint
CREATE UNIQUE INDEX "signing_challenges_nonce" ON "signing_challenges" USING btree ("nonce");--> statement-breakpoint
CREATE UNIQUE INDEX "signing_keys_fingerprint" ON "signing_keys" USING btree ("fingerprint");--> statement-breakpoint
CREATE INDEX "signing_keys_person" ON "signing_keys" USING btree ("person_id");--> statement-breakpoint
CREATE UNIQUE INDEX "signing_keys_one_active" ON "signing_keys" USING btree ("person_id") WHERE retired_at IS NULL;--> statement-breakpoint
CREATE INDEX "witness_requests_witness" ON "witness_requests" USING btree ("witness_id");--> statement-breakpoint
CREATE INDEX "witness_requests_entry" ON "witness_requests" USING btree ("entry_id");