CREATE TABLE "cohort_rungs" (
	"cohort_starts_on" date NOT NULL,
	"cohort_grade" smallint NOT NULL,
	"year_starts_on" date NOT NULL,
	"school_id" integer NOT NULL,
	"rung" smallint NOT NULL,
	"students" integer NOT NULL,
	CONSTRAINT "cohort_rungs_cohort_starts_on_cohort_grade_year_starts_on_school_id_rung_pk" PRIMARY KEY("cohort_starts_on","cohort_grade","year_starts_on","school_id","rung")
);
--> statement-breakpoint
ALTER TABLE "students" ADD COLUMN "cohort_starts_on" date;--> statement-breakpoint
ALTER TABLE "students" ADD COLUMN "cohort_grade" smallint;--> statement-breakpoint
ALTER TABLE "student_attainment" ADD COLUMN "cohort_starts_on" date;--> statement-breakpoint
ALTER TABLE "student_attainment" ADD COLUMN "cohort_grade" smallint;--> statement-breakpoint
ALTER TABLE "cohort_rungs" ADD CONSTRAINT "cohort_rungs_school_id_schools_id_fk" FOREIGN KEY ("school_id") REFERENCES "public"."schools"("id") ON DELETE no action ON UPDATE no action;