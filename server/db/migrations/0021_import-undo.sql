CREATE TABLE "roster_import_changes" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "roster_import_changes_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"import_id" integer NOT NULL,
	"kind" text NOT NULL,
	"student_id" integer,
	"enrollment_id" integer,
	"ensemble_id" integer,
	"before" jsonb,
	"version_after" integer
);
--> statement-breakpoint
ALTER TABLE "roster_imports" ADD COLUMN "school_ids" integer[] DEFAULT '{}'::integer[] NOT NULL;--> statement-breakpoint
ALTER TABLE "roster_imports" ADD COLUMN "school_year_id" integer;--> statement-breakpoint
ALTER TABLE "roster_imports" ADD COLUMN "undone_at" timestamp with time zone;--> statement-breakpoint
ALTER TABLE "roster_imports" ADD COLUMN "undone_by" integer;--> statement-breakpoint
ALTER TABLE "takes" ADD COLUMN "recorded_by" integer;--> statement-breakpoint
ALTER TABLE "roster_import_changes" ADD CONSTRAINT "roster_import_changes_import_id_roster_imports_id_fk" FOREIGN KEY ("import_id") REFERENCES "public"."roster_imports"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "roster_import_changes_import_idx" ON "roster_import_changes" USING btree ("import_id","kind");--> statement-breakpoint
ALTER TABLE "roster_imports" ADD CONSTRAINT "roster_imports_school_year_id_school_years_id_fk" FOREIGN KEY ("school_year_id") REFERENCES "public"."school_years"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "roster_imports" ADD CONSTRAINT "roster_imports_undone_by_users_id_fk" FOREIGN KEY ("undone_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "takes" ADD CONSTRAINT "takes_recorded_by_users_id_fk" FOREIGN KEY ("recorded_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;