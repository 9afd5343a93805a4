ALTER TABLE "student_attainment" ADD COLUMN "school_id" integer;--> statement-breakpoint
ALTER TABLE "student_attainment" ADD COLUMN "grade" smallint;--> statement-breakpoint
ALTER TABLE "student_attainment" ADD COLUMN "active" boolean DEFAULT true NOT NULL;--> statement-breakpoint
ALTER TABLE "student_attainment" ADD COLUMN "stale" boolean DEFAULT false NOT NULL;--> statement-breakpoint
CREATE INDEX "student_attainment_school_grade_rung_idx" ON "student_attainment" USING btree ("school_id","grade","rung","active");--> statement-breakpoint
CREATE INDEX "student_attainment_stale_idx" ON "student_attainment" USING btree ("student_id") WHERE stale;