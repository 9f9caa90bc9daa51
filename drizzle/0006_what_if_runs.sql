CREATE TABLE "what_if_runs" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"workspace_id" uuid NOT NULL,
	"project_id" uuid NOT NULL,
	"revision_id" uuid NOT NULL,
	"kind" text NOT NULL,
	"status" text DEFAULT 'queued' NOT NULL,
	"input" jsonb NOT NULL,
	"stack" jsonb NOT NULL,
	"result" jsonb,
	"progress_done" integer DEFAULT 0 NOT NULL,
	"progress_total" integer DEFAULT 0 NOT NULL,
	"error" text,
	"applied_revision_id" uuid,
	"created_by" text,
	"started_at" timestamp with time zone,
	"finished_at" timestamp with time zone,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "what_if_runs" ADD CONSTRAINT "what_if_runs_workspace_id_workspaces_id_fk" FOREIGN KEY ("workspace_id") REFERENCES "public"."workspaces"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "what_if_runs" ADD CONSTRAINT "what_if_runs_project_id_projects_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."projects"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "what_if_runs" ADD CONSTRAINT "what_if_runs_revision_id_stack_revisions_id_fk" FOREIGN KEY ("revision_id") REFERENCES "public"."stack_revisions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "what_if_runs" ADD CONSTRAINT "what_if_runs_applied_revision_id_stack_revisions_id_fk" FOREIGN KEY ("applied_revision_id") REFERENCES "public"."stack_revisions"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "what_if_runs" ADD CONSTRAINT "what_if_runs_created_by_users_id_fk" FOREIGN KEY ("created_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "what_if_runs_status_idx" ON "what_if_runs" USING btree ("status","created_at");--> statement-breakpoint
CREATE INDEX "what_if_runs_revision_idx" ON "what_if_runs" USING btree ("revision_id");