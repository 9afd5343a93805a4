CREATE TABLE "ladder_benchmarks" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "ladder_benchmarks_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"ladder_version_id" integer NOT NULL,
	"grade" smallint NOT NULL,
	"rung" smallint NOT NULL,
	"by_date" date NOT NULL
);
--> statement-breakpoint
CREATE TABLE "ladder_requirements" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "ladder_requirements_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"ladder_version_id" integer NOT NULL,
	"rung_id" integer NOT NULL,
	"position" smallint DEFAULT 0 NOT NULL,
	"code" text NOT NULL,
	"tonic" text NOT NULL,
	"mode" text NOT NULL,
	"pattern" text NOT NULL,
	"tempo" smallint NOT NULL,
	"articulation" text NOT NULL,
	"octaves" smallint DEFAULT 1 NOT NULL,
	"optional" boolean DEFAULT false NOT NULL,
	"families" text[]
);
--> statement-breakpoint
CREATE TABLE "ladder_rungs" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "ladder_rungs_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"ladder_version_id" integer NOT NULL,
	"number" smallint NOT NULL,
	"title" text NOT NULL
);
--> statement-breakpoint
CREATE TABLE "ladder_versions" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "ladder_versions_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"name" text NOT NULL,
	"status" text DEFAULT 'draft' NOT NULL,
	"active" boolean DEFAULT false NOT NULL,
	"published_at" timestamp with time zone,
	"created_by" integer,
	"version" integer DEFAULT 1 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "pass_off_recordings" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "pass_off_recordings_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"pass_off_id" integer NOT NULL,
	"stored_name" text NOT NULL,
	"original_name" text NOT NULL,
	"content_type" text NOT NULL,
	"size" integer NOT NULL,
	"sha256" text NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "pass_off_weeks" (
	"week_start" date NOT NULL,
	"school_id" integer NOT NULL,
	"grade" smallint NOT NULL,
	"heard" integer DEFAULT 0 NOT NULL,
	"passed" integer DEFAULT 0 NOT NULL,
	CONSTRAINT "pass_off_weeks_week_start_school_id_grade_pk" PRIMARY KEY("week_start","school_id","grade")
);
--> statement-breakpoint
CREATE TABLE "pass_offs" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "pass_offs_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"student_id" integer NOT NULL,
	"school_id" integer NOT NULL,
	"grade" smallint NOT NULL,
	"ladder_version_id" integer NOT NULL,
	"requirement_id" integer,
	"requirement_code" text NOT NULL,
	"heard_on" date NOT NULL,
	"tempo" smallint NOT NULL,
	"passed" boolean NOT NULL,
	"heard_by" integer,
	"note" text DEFAULT '' NOT NULL,
	"recording_id" integer,
	"client_key" uuid,
	"version" integer DEFAULT 1 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "passed_requirements" (
	"student_id" integer NOT NULL,
	"requirement_code" text NOT NULL,
	"best_tempo" smallint NOT NULL,
	"first_passed_on" date NOT NULL,
	CONSTRAINT "passed_requirements_student_id_requirement_code_pk" PRIMARY KEY("student_id","requirement_code")
);
--> statement-breakpoint
CREATE TABLE "student_attainment" (
	"student_id" integer PRIMARY KEY NOT NULL,
	"ladder_version_id" integer,
	"family" text DEFAULT '' NOT NULL,
	"rung" smallint DEFAULT 0 NOT NULL,
	"met_count" smallint DEFAULT 0 NOT NULL,
	"last_passed_on" date,
	"last_pass_off_on" date,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "ladder_benchmarks" ADD CONSTRAINT "ladder_benchmarks_ladder_version_id_ladder_versions_id_fk" FOREIGN KEY ("ladder_version_id") REFERENCES "public"."ladder_versions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ladder_requirements" ADD CONSTRAINT "ladder_requirements_ladder_version_id_ladder_versions_id_fk" FOREIGN KEY ("ladder_version_id") REFERENCES "public"."ladder_versions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ladder_requirements" ADD CONSTRAINT "ladder_requirements_rung_id_ladder_rungs_id_fk" FOREIGN KEY ("rung_id") REFERENCES "public"."ladder_rungs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ladder_rungs" ADD CONSTRAINT "ladder_rungs_ladder_version_id_ladder_versions_id_fk" FOREIGN KEY ("ladder_version_id") REFERENCES "public"."ladder_versions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "ladder_versions" ADD CONSTRAINT "ladder_versions_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "pass_off_recordings" ADD CONSTRAINT "pass_off_recordings_pass_off_id_pass_offs_id_fk" FOREIGN KEY ("pass_off_id") REFERENCES "public"."pass_offs"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "pass_off_weeks" ADD CONSTRAINT "pass_off_weeks_school_id_schools_id_fk" FOREIGN KEY ("school_id") REFERENCES "public"."schools"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "pass_offs" ADD CONSTRAINT "pass_offs_student_id_students_id_fk" FOREIGN KEY ("student_id") REFERENCES "public"."students"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "pass_offs" ADD CONSTRAINT "pass_offs_school_id_schools_id_fk" FOREIGN KEY ("school_id") REFERENCES "public"."schools"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "pass_offs" ADD CONSTRAINT "pass_offs_ladder_version_id_ladder_versions_id_fk" FOREIGN KEY ("ladder_version_id") REFERENCES "public"."ladder_versions"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "pass_offs" ADD CONSTRAINT "pass_offs_requirement_id_ladder_requirements_id_fk" FOREIGN KEY ("requirement_id") REFERENCES "public"."ladder_requirements"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "pass_offs" ADD CONSTRAINT "pass_offs_heard_by_users_id_fk" FOREIGN KEY ("heard_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "passed_requirements" ADD CONSTRAINT "passed_requirements_student_id_students_id_fk" FOREIGN KEY ("student_id") REFERENCES "public"."students"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "student_attainment" ADD CONSTRAINT "student_attainment_student_id_students_id_fk" FOREIGN KEY ("student_id") REFERENCES "public"."students"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "student_attainment" ADD CONSTRAINT "student_attainment_ladder_version_id_ladder_versions_id_fk" FOREIGN KEY ("ladder_version_id") REFERENCES "public"."ladder_versions"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE UNIQUE INDEX "ladder_benchmarks_unique" ON "ladder_benchmarks" USING btree ("ladder_version_id","grade","by_date");--> statement-breakpoint
CREATE UNIQUE INDEX "ladder_requirements_code_unique" ON "ladder_requirements" USING btree ("ladder_version_id","code");--> statement-breakpoint
CREATE INDEX "ladder_requirements_rung_idx" ON "ladder_requirements" USING btree ("rung_id","position");--> statement-breakpoint
CREATE UNIQUE INDEX "ladder_rungs_number_unique" ON "ladder_rungs" USING btree ("ladder_version_id","number");--> statement-breakpoint
CREATE UNIQUE INDEX "ladder_versions_one_active" ON "ladder_versions" USING btree ("active") WHERE active;--> statement-breakpoint
CREATE INDEX "pass_off_recordings_pass_off_idx" ON "pass_off_recordings" USING btree ("pass_off_id");--> statement-breakpoint
CREATE UNIQUE INDEX "pass_off_recordings_stored_unique" ON "pass_off_recordings" USING btree ("stored_name");--> statement-breakpoint
CREATE UNIQUE INDEX "pass_offs_client_key_unique" ON "pass_offs" USING btree ("client_key");--> statement-breakpoint
CREATE INDEX "pass_offs_student_idx" ON "pass_offs" USING btree ("student_id","heard_on");--> statement-breakpoint
CREATE INDEX "pass_offs_heard_on_idx" ON "pass_offs" USING btree ("heard_on");--> statement-breakpoint
CREATE INDEX "pass_offs_school_heard_on_idx" ON "pass_offs" USING btree ("school_id","heard_on");--> statement-breakpoint
CREATE INDEX "pass_offs_heard_by_idx" ON "pass_offs" USING btree ("heard_by","heard_on");--> statement-breakpoint
CREATE INDEX "pass_offs_requirement_idx" ON "pass_offs" USING btree ("requirement_code","heard_on");--> statement-breakpoint
CREATE INDEX "passed_requirements_code_idx" ON "passed_requirements" USING btree ("requirement_code","best_tempo");--> statement-breakpoint
CREATE INDEX "student_attainment_rung_idx" ON "student_attainment" USING btree ("rung");--> statement-breakpoint
CREATE INDEX "student_attainment_last_pass_off_idx" ON "student_attainment" USING btree ("last_pass_off_on");