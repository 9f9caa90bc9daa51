ALTER TABLE "dataset_mappings" ADD COLUMN "part" integer;--> statement-breakpoint
ALTER TABLE "datasets" ADD COLUMN "lot" text;--> statement-breakpoint
ALTER TABLE "datasets" ADD COLUMN "note" text;--> statement-breakpoint
ALTER TABLE "datasets" ADD COLUMN "lot_column" text;