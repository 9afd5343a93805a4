CREATE TABLE "oneroster_org_schools" (
	"sourced_id" text PRIMARY KEY NOT NULL,
	"org_name" text NOT NULL,
	"school_id" integer NOT NULL,
	"chosen" boolean DEFAULT false NOT NULL,
	"chosen_by" integer,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
CREATE TABLE "oneroster_sync" (
	"id" integer PRIMARY KEY NOT NULL,
	"base_url" text NOT NULL,
	"api_version" text DEFAULT '1.2' NOT NULL,
	"token_url" text NOT NULL,
	"client_id" text NOT NULL,
	"client_secret_encrypted" text NOT NULL,
	"enabled" boolean DEFAULT true NOT NULL,
	"run_at" text DEFAULT '02:00' NOT NULL,
	"changed_since" timestamp with time zone,
	"last_run_at" timestamp with time zone,
	"last_outcome" text,
	"last_error" text,
	"version" integer DEFAULT 1 NOT NULL,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "oneroster_org_schools" ADD CONSTRAINT "oneroster_org_schools_school_id_schools_id_fk" FOREIGN KEY ("school_id") REFERENCES "public"."schools"("id") ON DELETE no action ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "oneroster_org_schools" ADD CONSTRAINT "oneroster_org_schools_chosen_by_users_id_fk" FOREIGN KEY ("chosen_by") REFERENCES "public"."users"("id") ON DELETE no action ON UPDATE no action;