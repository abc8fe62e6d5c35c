CREATE TABLE "audit_checkpoints" (
	"id" bigserial PRIMARY KEY NOT NULL,
	"tree_size" integer NOT NULL,
	"last_sequence" bigint NOT NULL,
	"root_hash" text NOT NULL,
	"signed_at" timestamp with time zone NOT NULL,
	"records_key" text NOT NULL,
	"payload" text NOT NULL,
	"signature" text NOT NULL
);
--> statement-breakpoint
CREATE INDEX "audit_checkpoints_size" ON "audit_checkpoints" USING btree ("tree_size");