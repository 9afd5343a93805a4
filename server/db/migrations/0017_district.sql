CREATE TABLE "districts" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "districts_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"name" text NOT NULL,
	"short_name" text DEFAULT '' NOT NULL,
	"time_zone" text NOT NULL,
	"contact_address" text DEFAULT '' NOT NULL,
	"contact_phone" text DEFAULT '' NOT NULL,
	"contact_email" text DEFAULT '' NOT NULL,
	"mail_sender_name" text DEFAULT '' NOT NULL,
	"logo_data" text,
	"logo_type" text,
	"logo_version" integer DEFAULT 0 NOT NULL,
	"version" integer DEFAULT 1 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "districts_logo_type" CHECK ("districts"."logo_type" in ('image/png', 'image/svg+xml'))
);
--> statement-breakpoint
ALTER TABLE "schools" ADD COLUMN "lowest_grade" integer;--> statement-breakpoint
ALTER TABLE "schools" ADD COLUMN "highest_grade" integer;--> statement-breakpoint
ALTER TABLE "schools" ADD COLUMN "sends_to_school_id" integer;--> statement-breakpoint
ALTER TABLE "schools" ADD COLUMN "closed_on" date;--> statement-breakpoint
CREATE UNIQUE INDEX "districts_one_row" ON "districts" USING btree ((true));--> statement-breakpoint
ALTER TABLE "schools" ADD CONSTRAINT "schools_sends_to_school_id_schools_id_fk" FOREIGN KEY ("sends_to_school_id") REFERENCES "public"."schools"("id") ON DELETE no action ON UPDATE no action;