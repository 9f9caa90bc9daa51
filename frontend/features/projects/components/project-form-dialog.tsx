import { zodResolver } from "@hookform/resolvers/zod";
import { useForm, type FieldErrors, type UseFormRegisterReturn } from "react-hook-form";
import { useNavigate } from "react-router";
import { CreateProjectSchema, UpdateProjectSchema, type Project, type UpdateProject } from "@shared/schemas/api";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { Dialog } from "@frontend/components/ui/dialog";
import { Field, Input, Textarea } from "@frontend/components/ui/field";
import { setServerErrors } from "@frontend/lib/form";
import { useCreateProject } from "../api/create-project";
import { useUpdateProject } from "../api/update-project";

type Key = "name" | "description";
type Messages = { name?: string; description?: string; form?: string };
const messages = (e: FieldErrors<Partial<Record<Key, string>>>): Messages => ({
  name: e.name?.message,
  description: e.description?.message,
  form: e.root?.server?.message,
});

function ProjectFields({
  register,
  errors,
  disabled,
}: {
  register: (field: Key) => UseFormRegisterReturn;
  errors: Messages;
  disabled: boolean;
}) {
  return (
    <div className="space-y-4">
      {errors.form ? <Alert>{errors.form}</Alert> : null}
      <Field label="Project name" error={errors.name} hint="The product and package, e.g. “Trail watch sensor module, rev C”.">
        {({ id, describedBy, invalid }) => (
          <Input id={id} invalid={invalid} aria-describedby={describedBy} autoComplete="off" disabled={disabled} {...register("name")} />
        )}
      </Field>
      <Field label="Description" aside="optional" error={errors.description}>
        {({ id, describedBy, invalid }) => (
          <Textarea
            id={id}
            rows={3}
            invalid={invalid}
            aria-describedby={describedBy}
            disabled={disabled}
            placeholder="What the package is for, the budget it must meet, who asked."
            {...register("description")}
          />
        )}
      </Field>
    </div>
  );
}

/** New project: checked with the same schema the server uses, then the server's own field errors. */
export function CreateProjectDialog({ open, onClose }: { open: boolean; onClose: () => void }) {
  const form = useForm({ resolver: zodResolver(CreateProjectSchema), defaultValues: { name: "", description: "" } });
  const create = useCreateProject();
  const navigate = useNavigate();

  function close() {
    form.reset();
    create.reset();
    onClose();
  }

  const submit = form.handleSubmit((project) =>
    create.mutate(project, {
      onSuccess: (created) => {
        close();
        navigate(`/projects/${created.id}`);
      },
      onError: (error) => setServerErrors(form, error),
    }),
  );

  return (
    <Dialog
      open={open}
      onClose={close}
      busy={create.isPending}
      title="New project"
      description="A project holds one package's stack revisions, studies, data sets and supplier reports."
      onSubmit={submit}
      formLabel="New project"
      footer={
        <>
          <Button variant="secondary" onClick={close} disabled={create.isPending}>
            Cancel
          </Button>
          <Button type="submit" variant="primary" pending={create.isPending}>
            Create project
          </Button>
        </>
      }
    >
      <ProjectFields register={form.register} errors={messages(form.formState.errors)} disabled={create.isPending} />
    </Dialog>
  );
}

/** Rename and re-describe; only what changed is sent. */
export function EditProjectDialog({ project, open, onClose }: { project: Project; open: boolean; onClose: () => void }) {
  const form = useForm({
    resolver: zodResolver(UpdateProjectSchema),
    defaultValues: { name: project.name, description: project.description },
  });
  const update = useUpdateProject();

  function close() {
    update.reset();
    onClose();
  }

  const submit = form.handleSubmit(({ name, description }) => {
    const changes: UpdateProject = {};
    if (name !== project.name) changes.name = name;
    if (description !== project.description) changes.description = description;
    if (Object.keys(changes).length === 0) return close();
    update.mutate(
      { id: project.id, version: project.version, changes },
      { onSuccess: close, onError: (error) => setServerErrors(form, error) },
    );
  });

  return (
    <Dialog
      open={open}
      onClose={close}
      busy={update.isPending}
      title="Rename project"
      description={`Currently “${project.name}”.`}
      onSubmit={submit}
      formLabel="Rename project"
      footer={
        <>
          <Button variant="secondary" onClick={close} disabled={update.isPending}>
            Cancel
          </Button>
          <Button type="submit" variant="primary" pending={update.isPending}>
            Save changes
          </Button>
        </>
      }
    >
      <ProjectFields register={form.register} errors={messages(form.formState.errors)} disabled={update.isPending} />
    </Dialog>
  );
}
