CREATE TABLE "dataset_mappings" (
	"dataset_id" uuid NOT NULL,
	"column" text NOT NULL,
	"revision_id" uuid NOT NULL,
	"source" text NOT NULL,
	"unit" text NOT NULL,
	"nominal" double precision DEFAULT 0 NOT NULL,
	"updated_by" text,
	"updated_at" timestamp with time zone DEFAULT now() NOT NULL,
	CONSTRAINT "dataset_mappings_dataset_id_column_pk" PRIMARY KEY("dataset_id","column")
);
--> statement-breakpoint
CREATE TABLE "datasets" (
	"id" uuid PRIMARY KEY DEFAULT gen_random_uuid() NOT NULL,
	"workspace_id" uuid NOT NULL,
	"project_id" uuid NOT NULL,
	"name" text NOT NULL,
	"file_type" text NOT NULL,
	"sheet" text,
	"size_bytes" integer NOT NULL,
	"sha256" text NOT NULL,
	"row_count" integer NOT NULL,
	"columns" jsonb NOT NULL,
	"data" jsonb NOT NULL,
	"preview" jsonb NOT NULL,
	"row_numbers" jsonb NOT NULL,
	"file" "bytea" NOT NULL,
	"uploaded_by" text,
	"uploader_role" text NOT NULL,
	"supplier_id" uuid,
	"report_id" uuid,
	"created_at" timestamp with time zone DEFAULT now() NOT NULL
);
--> statement-breakpoint
ALTER TABLE "studies" ADD COLUMN "as_built" jsonb;--> statement-breakpoint
ALTER TABLE "dataset_mappings" ADD CONSTRAINT "dataset_mappings_dataset_id_datasets_id_fk" FOREIGN KEY ("dataset_id") REFERENCES "public"."datasets"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dataset_mappings" ADD CONSTRAINT "dataset_mappings_revision_id_stack_revisions_id_fk" FOREIGN KEY ("revision_id") REFERENCES "public"."stack_revisions"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "dataset_mappings" ADD CONSTRAINT "dataset_mappings_updated_by_users_id_fk" FOREIGN KEY ("updated_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "datasets" ADD CONSTRAINT "datasets_workspace_id_workspaces_id_fk" FOREIGN KEY ("workspace_id") REFERENCES "public"."workspaces"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "datasets" ADD CONSTRAINT "datasets_project_id_projects_id_fk" FOREIGN KEY ("project_id") REFERENCES "public"."projects"("id") ON DELETE cascade ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "datasets" ADD CONSTRAINT "datasets_uploaded_by_users_id_fk" FOREIGN KEY ("uploaded_by") REFERENCES "public"."users"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "datasets" ADD CONSTRAINT "datasets_supplier_id_suppliers_id_fk" FOREIGN KEY ("supplier_id") REFERENCES "public"."suppliers"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
ALTER TABLE "datasets" ADD CONSTRAINT "datasets_report_id_reports_id_fk" FOREIGN KEY ("report_id") REFERENCES "public"."reports"("id") ON DELETE set null ON UPDATE no action;--> statement-breakpoint
CREATE INDEX "datasets_project_idx" ON "datasets" USING btree ("project_id","created_at");--> statement-breakpoint
CREATE INDEX "datasets_report_idx" ON "datasets" USING btree ("report_id");