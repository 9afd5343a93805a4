CREATE TABLE "count_scans" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "count_scans_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"count_id" integer NOT NULL,
	"asset_tag" text NOT NULL,
	"instrument_id" integer,
	"outcome" text NOT NULL,
	"scanned_by" integer,
	"scanned_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "counts" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "counts_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"school_id" integer NOT NULL,
	"started_by" integer,
	"started_at" timestamp with time zone DEFAULT now() NOT NULL,
	"closed_at" timestamp with time zone,
	"state" text DEFAULT 'open' NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "instrument_events" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "instrument_events_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"instrument_id" integer NOT NULL,
	"kind" text NOT NULL,
	"at" timestamp with time zone DEFAULT now() NOT NULL,
	"note" text DEFAULT '' NOT NULL,
	"user_id" integer,
	"loan_id" integer,
	"repair_id" integer,
	"count_id" integer
);
--> statement-breakpoint
CREATE TABLE "instrument_photos" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "instrument_photos_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"instrument_id" integer NOT NULL,
	"file_name" text NOT NULL,
	"content_type" text NOT NULL,
	"size_bytes" integer NOT NULL,
	"uploaded_by" integer,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "instruments" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "instruments_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"asset_tag" text NOT NULL,
	"instrument_id" text NOT NULL,
	"maker" text DEFAULT '' NOT NULL,
	"model" text DEFAULT '' NOT NULL,
	"serial" text DEFAULT '' NOT NULL,
	"purchased_on" date,
	"purchase_cost_cents" integer,
	"funding_source" text DEFAULT '' NOT NULL,
	"condition" text DEFAULT 'good' NOT NULL,
	"status" text DEFAULT 'available' NOT NULL,
	"home_school_id" integer NOT NULL,
	"location" text DEFAULT '' NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"version" integer DEFAULT 1 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "loans" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "loans_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"instrument_id" integer NOT NULL,
	"student_id" integer NOT NULL,
	"school_id" integer NOT NULL,
	"checked_out_on" date NOT NULL,
	"due_on" date NOT NULL,
	"accessories" text[] DEFAULT '{}' NOT NULL,
	"condition_out" text NOT NULL,
	"condition_in" text,
	"returned_on" date,
	"usage_fee_cents" integer DEFAULT 0 NOT NULL,
	"waiver" boolean DEFAULT false NOT NULL,
	"waiver_reason" text,
	"state" text DEFAULT 'active' NOT NULL,
	"checked_out_by" integer,
	"agreement_token_hash" text,
	"agreement_expires_at" timestamp with time zone,
	"signed_name" text,
	"signed_at" timestamp with time zone,
	"signed_text" text,
	"agreement_text_hash" text,
	"agreement_text_version" integer,
	"version" integer DEFAULT 1 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "repair_tickets" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "repair_tickets_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"instrument_id" integer NOT NULL,
	"problem" text NOT NULL,
	"reported_by" integer,
	"vendor" text,
	"in_house" boolean DEFAULT true NOT NULL,
	"estimate_cents" integer,
	"final_cost_cents" integer,
	"sent_on" date,
	"returned_on" date,
	"status" text DEFAULT 'open' NOT NULL,
	"notes" text DEFAULT '' NOT NULL,
	"loan_id" integer,
	"version" integer DEFAULT 1 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "count_scans" ADD CONSTRAINT "count_scans_count_id_counts_id_fk" FOREIGN KEY ("count_id") REFERENCES "public"."counts"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "count_scans" ADD CONSTRAINT "count_scans_instrument_id_instruments_id_fk" FOREIGN KEY ("instrument_id") REFERENCES "public"."instruments"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "count_scans" ADD CONSTRAINT "count_scans_scanned_by_users_id_fk" FOREIGN KEY ("scanned_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "counts" ADD CONSTRAINT "counts_school_id_schools_id_fk" FOREIGN KEY ("school_id") REFERENCES "public"."schools"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "counts" ADD CONSTRAINT "counts_started_by_users_id_fk" FOREIGN KEY ("started_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "instrument_events" ADD CONSTRAINT "instrument_events_instrument_id_instruments_id_fk" FOREIGN KEY ("instrument_id") REFERENCES "public"."instruments"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "instrument_events" ADD CONSTRAINT "instrument_events_user_id_users_id_fk" FOREIGN KEY ("user_id") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "instrument_photos" ADD CONSTRAINT "instrument_photos_instrument_id_instruments_id_fk" FOREIGN KEY ("instrument_id") REFERENCES "public"."instruments"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "instrument_photos" ADD CONSTRAINT "instrument_photos_uploaded_by_users_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "instruments" ADD CONSTRAINT "instruments_home_school_id_schools_id_fk" FOREIGN KEY ("home_school_id") REFERENCES "public"."schools"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "loans" ADD CONSTRAINT "loans_instrument_id_instruments_id_fk" FOREIGN KEY ("instrument_id") REFERENCES "public"."instruments"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "loans" ADD CONSTRAINT "loans_student_id_students_id_fk" FOREIGN KEY ("student_id") REFERENCES "public"."students"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "loans" ADD CONSTRAINT "loans_school_id_schools_id_fk" FOREIGN KEY ("school_id") REFERENCES "public"."schools"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "loans" ADD CONSTRAINT "loans_checked_out_by_users_id_fk" FOREIGN KEY ("checked_out_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "repair_tickets" ADD CONSTRAINT "repair_tickets_instrument_id_instruments_id_fk" FOREIGN KEY ("instrument_id") REFERENCES "public"."instruments"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "repair_tickets" ADD CONSTRAINT "repair_tickets_reported_by_users_id_fk" FOREIGN KEY ("reported_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "count_scans_count_idx" ON "count_scans" USING btree ("count_id","instrument_id");--> statement-breakpoint
CREATE INDEX "counts_school_idx" ON "counts" USING btree ("school_id","started_at");--> statement-breakpoint
CREATE INDEX "instrument_events_instrument_idx" ON "instrument_events" USING btree ("instrument_id","at");--> statement-breakpoint
CREATE INDEX "instrument_photos_instrument_idx" ON "instrument_photos" USING btree ("instrument_id");--> statement-breakpoint
CREATE UNIQUE INDEX "instruments_asset_tag_unique" ON "instruments" USING btree ("asset_tag");--> statement-breakpoint
CREATE INDEX "instruments_school_idx" ON "instruments" USING btree ("home_school_id","asset_tag");--> statement-breakpoint
CREATE INDEX "instruments_status_idx" ON "instruments" USING btree ("status","asset_tag");--> statement-breakpoint
CREATE INDEX "instruments_kind_idx" ON "instruments" USING btree ("instrument_id","asset_tag");--> statement-breakpoint
CREATE INDEX "instruments_condition_idx" ON "instruments" USING btree ("condition","asset_tag");--> statement-breakpoint
CREATE INDEX "instruments_purchased_idx" ON "instruments" USING btree ("purchased_on","id");--> statement-breakpoint
CREATE UNIQUE INDEX "loans_one_active_per_instrument" ON "loans" USING btree ("instrument_id") WHERE state = 'active';--> statement-breakpoint
CREATE UNIQUE INDEX "loans_agreement_token_unique" ON "loans" USING btree ("agreement_token_hash");--> statement-breakpoint
CREATE INDEX "loans_school_idx" ON "loans" USING btree ("school_id","state","due_on");--> statement-breakpoint
CREATE INDEX "loans_student_idx" ON "loans" USING btree ("student_id");--> statement-breakpoint
CREATE INDEX "loans_due_idx" ON "loans" USING btree ("state","due_on");--> statement-breakpoint
CREATE INDEX "repair_tickets_instrument_idx" ON "repair_tickets" USING btree ("instrument_id","status");--> statement-breakpoint
CREATE INDEX "repair_tickets_status_idx" ON "repair_tickets" USING btree ("status","created_at");