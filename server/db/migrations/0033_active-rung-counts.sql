CREATE TABLE "active_rung_counts" (
	"school_id" integer,
	"grade" smallint,
	"rung" smallint NOT NULL,
	"students" integer NOT NULL,
	"cohort_starts_on" date,
	"cohort_grade" smallint,
	"dated" smallint NOT NULL,
	CONSTRAINT "active_rung_counts_key" UNIQUE NULLS NOT DISTINCT("school_id","grade","cohort_starts_on","cohort_grade","rung","dated")
);
--> statement-breakpoint
CREATE TABLE "active_rung_days" (
	"reached_on" date NOT NULL,
	"school_id" integer,
	"grade" smallint,
	"rung" smallint NOT NULL,
	"students" integer NOT NULL,
	CONSTRAINT "active_rung_days_key" UNIQUE NULLS NOT DISTINCT("reached_on","school_id","grade","rung")
);
--> statement-breakpoint
CREATE TABLE "active_rung_rebuilds" (
	"pending" boolean PRIMARY KEY NOT NULL
);
