CREATE TABLE "takes" (
	"id" integer PRIMARY KEY GENERATED ALWAYS AS IDENTITY (sequence name "takes_id_seq" INCREMENT BY 1 MINVALUE 1 MAXVALUE 2147483647 START WITH 1 CACHE 1),
	"student_id" integer NOT NULL,
	"requirement_id" text NOT NULL,
	"tempo_asked" integer NOT NULL,
	"stored_name" text NOT NULL,
	"content_type" text NOT NULL,
	"size" integer NOT NULL,
	"analysis" jsonb NOT NULL,
	"status" text DEFAULT 'kept' NOT NULL,
	"sent_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "takes" ADD CONSTRAINT "takes_student_id_students_id_fk" FOREIGN KEY ("student_id") REFERENCES "public"."students"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "takes_student_idx" ON "takes" USING btree ("student_id","created_at");--> statement-breakpoint
CREATE UNIQUE INDEX "takes_stored_unique" ON "takes" USING btree ("stored_name");