import { useState } from "react";
import { zodResolver } from "@hookform/resolvers/zod";
import { useForm, type UseFormRegisterReturn } from "react-hook-form";
import { AccountUpdateSchema, ChangePasswordSchema, ResetPasswordSchema } from "@shared/schemas/api";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { Field, Input } from "@frontend/components/ui/field";
import { setServerErrors } from "@frontend/lib/form";
import { useChangePassword, useResetPassword, useUpdateName } from "../api/passwords";

function PasswordInput({
  field,
  error,
  label,
  hint,
  autoComplete,
}: {
  field: UseFormRegisterReturn;
  error?: string;
  label: string;
  hint?: string;
  autoComplete: string;
}) {
  return (
    <Field label={label} error={error} hint={hint}>
      {({ id, describedBy, invalid }) => (
        <Input id={id} type="password" autoComplete={autoComplete} invalid={invalid} aria-describedby={describedBy} {...field} />
      )}
    </Field>
  );
}

/** Sets a new password from a reset link; afterwards the person signs in with it. */
export function ResetPasswordForm({ token, onDone }: { token: string; onDone: () => void }) {
  const form = useForm({ resolver: zodResolver(ResetPasswordSchema), defaultValues: { newPassword: "" } });
  const { errors } = form.formState;
  const reset = useResetPassword();

  const submit = form.handleSubmit(({ newPassword }) =>
    reset.mutate({ token, newPassword }, { onSuccess: onDone, onError: (e) => setServerErrors(form, e) }),
  );

  return (
    <form onSubmit={submit} noValidate aria-label="Set a new password" className="space-y-4">
      {errors.root?.server ? <Alert>{errors.root.server.message}</Alert> : null}
      <PasswordInput
        field={form.register("newPassword")}
        label="New password"
        hint="At least 10 characters. Every place you are signed in is signed out."
        autoComplete="new-password"
        error={errors.newPassword?.message}
      />
      <Button type="submit" variant="primary" className="w-full" pending={reset.isPending}>
        Set the password
      </Button>
    </form>
  );
}

/** The signed-in person's own password; the other places they are signed in are signed out. */
export function ChangePasswordForm() {
  const form = useForm({ resolver: zodResolver(ChangePasswordSchema), defaultValues: { currentPassword: "", newPassword: "" } });
  const { errors } = form.formState;
  const [done, setDone] = useState(false);
  const change = useChangePassword();

  const submit = form.handleSubmit((data) =>
    change.mutate(data, {
      onSuccess: () => {
        setDone(true);
        form.reset();
      },
      onError: (e) => setServerErrors(form, e),
    }),
  );

  return (
    <form
      onSubmit={(event) => {
        setDone(false);
        return submit(event);
      }}
      noValidate
      aria-label="Change password"
      className="max-w-sm space-y-4"
    >
      {errors.root?.server ? <Alert>{errors.root.server.message}</Alert> : null}
      {done ? <Alert tone="info">Password changed. You were signed out everywhere else.</Alert> : null}
      <PasswordInput
        field={form.register("currentPassword")}
        label="Current password"
        autoComplete="current-password"
        error={errors.currentPassword?.message}
      />
      <PasswordInput
        field={form.register("newPassword")}
        label="New password"
        hint="At least 10 characters."
        autoComplete="new-password"
        error={errors.newPassword?.message}
      />
      <Button type="submit" variant="primary" pending={change.isPending}>
        Change password
      </Button>
    </form>
  );
}

/** The name colleagues see on activity and reviews. */
export function NameForm({ current }: { current: string }) {
  const form = useForm({ resolver: zodResolver(AccountUpdateSchema), defaultValues: { name: current } });
  const { errors } = form.formState;
  const update = useUpdateName();
  const name = form.watch("name");

  const submit = form.handleSubmit((data) => update.mutate(data.name, { onError: (e) => setServerErrors(form, e) }));

  return (
    <form onSubmit={submit} noValidate aria-label="Your name" className="max-w-sm space-y-4">
      {errors.root?.server ? <Alert>{errors.root.server.message}</Alert> : null}
      <Field label="Your name" error={errors.name?.message}>
        {({ id, describedBy, invalid }) => (
          <Input id={id} autoComplete="name" invalid={invalid} aria-describedby={describedBy} {...form.register("name")} />
        )}
      </Field>
      <Button type="submit" variant="secondary" pending={update.isPending} disabled={name.trim() === current}>
        Save name
      </Button>
    </form>
  );
}
