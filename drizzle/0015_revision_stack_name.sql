ALTER TABLE "stack_revisions" ADD COLUMN "stack_name" text DEFAULT '' NOT NULL;--> statement-breakpoint
-- The stack's name kept beside it, so that the revisions list reads a short column instead of
-- every whole stack (up to about 1 MB each). Set here, from the stored stack, on every insert
-- and every update of the stack, so no writer can forget it.
CREATE FUNCTION "stack_revisions_stack_name"() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  NEW."stack_name" := coalesce(NEW."stack" ->> 'name', '');
  RETURN NEW;
END
$$;
--> statement-breakpoint
CREATE TRIGGER "stack_revisions_stack_name" BEFORE INSERT OR UPDATE OF "stack" ON "stack_revisions"
  FOR EACH ROW EXECUTE FUNCTION "stack_revisions_stack_name"();
--> statement-breakpoint
UPDATE "stack_revisions" SET "stack_name" = coalesce("stack" ->> 'name', '');
