import { useState, type FormEvent } from "react";
import { useNavigate } from "react-router";
import { CreateProjectSchema, UpdateProjectSchema, type Project } from "@shared/schemas/api";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { Dialog } from "@frontend/components/ui/dialog";
import { Field, Input, Textarea } from "@frontend/components/ui/field";
import { parseForm, serverFieldErrors, type FieldErrors } from "@frontend/lib/form";
import { useCreateProject } from "../api/create-project";
import { useUpdateProject } from "../api/update-project";

type Values = { name: string; description: string };

function ProjectFields({
  values,
  errors,
  onChange,
  disabled,
}: {
  values: Values;
  errors: FieldErrors;
  onChange: (v: Values) => void;
  disabled: boolean;
}) {
  return (
    <div className="space-y-4">
      {errors._form ? <Alert>{errors._form}</Alert> : null}
      <Field label="Project name" error={errors.name} hint="The product and package, e.g. “Trail watch sensor module, rev C”.">
        {({ id, describedBy, invalid }) => (
          <Input
            id={id}
            name="name"
            value={values.name}
            invalid={invalid}
            aria-describedby={describedBy}
            autoComplete="off"
            disabled={disabled}
            onChange={(e) => onChange({ ...values, name: e.target.value })}
          />
        )}
      </Field>
      <Field label="Description" aside="optional" error={errors.description}>
        {({ id, describedBy, invalid }) => (
          <Textarea
            id={id}
            name="description"
            rows={3}
            value={values.description}
            invalid={invalid}
            aria-describedby={describedBy}
            disabled={disabled}
            placeholder="What the package is for, the budget it must meet, who asked."
            onChange={(e) => onChange({ ...values, description: e.target.value })}
          />
        )}
      </Field>
    </div>
  );
}

/** New project: checked with the same schema the server uses, then the server's own field errors. */
export function CreateProjectDialog({ open, onClose }: { open: boolean; onClose: () => void }) {
  const [values, setValues] = useState<Values>({ name: "", description: "" });
  const [errors, setErrors] = useState<FieldErrors>({});
  const create = useCreateProject();
  const navigate = useNavigate();

  function close() {
    setValues({ name: "", description: "" });
    setErrors({});
    create.reset();
    onClose();
  }

  function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const parsed = parseForm(CreateProjectSchema, values);
    if (!parsed.ok) return setErrors(parsed.errors);
    setErrors({});
    create.mutate(parsed.data, {
      onSuccess: (project) => {
        close();
        navigate(`/projects/${project.id}`);
      },
      onError: (error) => setErrors(serverFieldErrors(error)),
    });
  }

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
      <ProjectFields values={values} errors={errors} onChange={setValues} disabled={create.isPending} />
    </Dialog>
  );
}

/** Rename and re-describe; only what changed is sent. */
export function EditProjectDialog({ project, open, onClose }: { project: Project; open: boolean; onClose: () => void }) {
  const [values, setValues] = useState<Values>({ name: project.name, description: project.description });
  const [errors, setErrors] = useState<FieldErrors>({});
  const update = useUpdateProject();

  function close() {
    setErrors({});
    update.reset();
    onClose();
  }

  function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const changes: Partial<Values> = {};
    if (values.name !== project.name) changes.name = values.name;
    if (values.description !== project.description) changes.description = values.description;
    if (Object.keys(changes).length === 0) return close();
    const parsed = parseForm(UpdateProjectSchema, changes);
    if (!parsed.ok) return setErrors(parsed.errors);
    setErrors({});
    update.mutate(
      { id: project.id, version: project.version, changes: parsed.data },
      { onSuccess: close, onError: (error) => setErrors(serverFieldErrors(error)) },
    );
  }

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
      <ProjectFields values={values} errors={errors} onChange={setValues} disabled={update.isPending} />
    </Dialog>
  );
}
