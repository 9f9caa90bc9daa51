CREATE TABLE "queue_workers" (
	"id" text PRIMARY KEY NOT NULL,
	"host" text NOT NULL,
	"pid" integer NOT NULL,
	"threads" integer NOT NULL,
	"jobs_done" integer DEFAULT 0 NOT NULL,
	"started_at" timestamp with time zone NOT NULL,
	"seen_at" timestamp with time zone NOT NULL
);
--> statement-breakpoint
CREATE TABLE "study_parts" (
	"study_id" uuid NOT NULL,
	"part" integer NOT NULL,
	"block_from" integer NOT NULL,
	"block_to" integer NOT NULL,
	"trials_done" integer DEFAULT 0 NOT NULL,
	"data" "bytea",
	"finished_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "study_parts_study_id_part_pk" PRIMARY KEY("study_id","part")
);
--> statement-breakpoint
ALTER TABLE "study_parts" ADD CONSTRAINT "study_parts_study_id_studies_id_fk" FOREIGN KEY ("study_id") REFERENCES "public"."studies"("id") ON DELETE cascade ON UPDATE no action;