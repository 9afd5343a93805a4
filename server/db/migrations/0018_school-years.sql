CREATE TABLE "student_years" (
	"student_id" integer NOT NULL,
	"school_year_id" integer NOT NULL,
	"school_id" integer NOT NULL,
	"grade" integer NOT NULL,
	"outcome" text NOT NULL,
	"rung" integer DEFAULT 0 NOT NULL,
	CONSTRAINT "student_years_student_id_school_year_id_pk" PRIMARY KEY("student_id","school_year_id")
);
--> statement-breakpoint
ALTER TABLE "school_years" ADD COLUMN "version" integer DEFAULT 1 NOT NULL;--> statement-breakpoint
ALTER TABLE "student_years" ADD CONSTRAINT "student_years_student_id_students_id_fk" FOREIGN KEY ("student_id") REFERENCES "public"."students"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "student_years" ADD CONSTRAINT "student_years_school_year_id_school_years_id_fk" FOREIGN KEY ("school_year_id") REFERENCES "public"."school_years"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "student_years" ADD CONSTRAINT "student_years_school_id_schools_id_fk" FOREIGN KEY ("school_id") REFERENCES "public"."schools"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "student_years_year_school_idx" ON "student_years" USING btree ("school_year_id","school_id","grade");--> statement-breakpoint
CREATE UNIQUE INDEX "school_years_one_current" ON "school_years" USING btree ("current") WHERE current;