ALTER TABLE "entries" DROP COLUMN "state";--> statement-breakpoint
DROP TYPE "public"."entry_state";