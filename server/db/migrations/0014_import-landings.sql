CREATE TABLE "roster_import_landings" (
	"run" text NOT NULL,
	"student_id" integer,
	"ensemble_id" integer
);
--> statement-breakpoint
ALTER TABLE "roster_import_landings" ADD CONSTRAINT "roster_import_landings_student_id_students_id_fk" FOREIGN KEY ("student_id") REFERENCES "public"."students"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "roster_import_landings" ADD CONSTRAINT "roster_import_landings_ensemble_id_ensembles_id_fk" FOREIGN KEY ("ensemble_id") REFERENCES "public"."ensembles"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "roster_import_landings_run_idx" ON "roster_import_landings" USING btree ("run");