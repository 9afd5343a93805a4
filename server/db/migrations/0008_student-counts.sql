CREATE TABLE "student_counts" (
	"school_id" integer NOT NULL,
	"grade" smallint NOT NULL,
	"status" text NOT NULL,
	"students" integer NOT NULL,
	CONSTRAINT "student_counts_school_id_grade_status_pk" PRIMARY KEY("school_id","grade","status")
);
