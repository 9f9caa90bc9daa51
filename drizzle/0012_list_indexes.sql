DROP INDEX "projects_workspace_idx";--> statement-breakpoint
CREATE INDEX "projects_workspace_name_idx" ON "projects" USING btree ("workspace_id","name");--> statement-breakpoint
CREATE INDEX "dataset_mappings_revision_idx" ON "dataset_mappings" USING btree ("revision_id");