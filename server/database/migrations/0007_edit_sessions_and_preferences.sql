CREATE TABLE "entry_edit_sessions" (
	"entry_id" uuid PRIMARY KEY NOT NULL,
	"person_id" uuid NOT NULL,
	"person_email" text NOT NULL,
	"version" integer NOT NULL,
	"started_at" timestamp (3) with time zone NOT NULL,
	"last_saved_at" timestamp (3) with time zone NOT NULL,
	"saves" integer NOT NULL,
	"first_lock_version" integer NOT NULL,
	"last_lock_version" integer NOT NULL,
	"first_content_hash" text NOT NULL,
	"last_content_hash" text NOT NULL,
	"title_changed" boolean DEFAULT false NOT NULL
);
--> statement-breakpoint
CREATE TABLE "person_preferences" (
	"person_id" uuid PRIMARY KEY NOT NULL,
	"significant_figures" integer,
	"energy_unit" text,
	"pressure_unit" text,
	"temperature_unit" text,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "entry_edit_sessions" ADD CONSTRAINT "entry_edit_sessions_entry_id_entries_id_fk" FOREIGN KEY ("entry_id") REFERENCES "public"."entries"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "entry_edit_sessions" ADD CONSTRAINT "entry_edit_sessions_person_id_people_id_fk" FOREIGN KEY ("person_id") REFERENCES "public"."people"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "person_preferences" ADD CONSTRAINT "person_preferences_person_id_people_id_fk" FOREIGN KEY ("person_id") REFERENCES "public"."people"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "entry_edit_sessions_last_saved" ON "entry_edit_sessions" USING btree ("last_saved_at");