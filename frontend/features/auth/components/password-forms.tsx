import { useState, type FormEvent } from "react";
import { AccountUpdateSchema, ChangePasswordSchema, ResetPasswordSchema } from "@shared/schemas/api";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { Field, Input } from "@frontend/components/ui/field";
import { parseForm, serverFieldErrors, type FieldErrors } from "@frontend/lib/form";
import { useChangePassword, useResetPassword, useUpdateName } from "../api/passwords";

function PasswordInput({
  name,
  value,
  onChange,
  error,
  label,
  hint,
  autoComplete,
}: {
  name: string;
  value: string;
  onChange: (v: string) => void;
  error?: string;
  label: string;
  hint?: string;
  autoComplete: string;
}) {
  return (
    <Field label={label} error={error} hint={hint}>
      {({ id, describedBy, invalid }) => (
        <Input
          id={id}
          name={name}
          type="password"
          autoComplete={autoComplete}
          value={value}
          invalid={invalid}
          aria-describedby={describedBy}
          onChange={(e) => onChange(e.target.value)}
        />
      )}
    </Field>
  );
}

/** Sets a new password from a reset link; afterwards the person signs in with it. */
export function ResetPasswordForm({ token, onDone }: { token: string; onDone: () => void }) {
  const [newPassword, setNewPassword] = useState("");
  const [errors, setErrors] = useState<FieldErrors>({});
  const reset = useResetPassword();

  function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const parsed = parseForm(ResetPasswordSchema, { newPassword });
    if (!parsed.ok) return setErrors(parsed.errors);
    setErrors({});
    reset.mutate({ token, newPassword: parsed.data.newPassword }, { onSuccess: onDone, onError: (e) => setErrors(serverFieldErrors(e)) });
  }

  return (
    <form onSubmit={submit} noValidate aria-label="Set a new password" className="space-y-4">
      {errors._form ? <Alert>{errors._form}</Alert> : null}
      <PasswordInput
        name="newPassword"
        label="New password"
        hint="At least 10 characters. Every place you are signed in is signed out."
        autoComplete="new-password"
        value={newPassword}
        onChange={setNewPassword}
        error={errors.newPassword}
      />
      <Button type="submit" variant="primary" className="w-full" pending={reset.isPending}>
        Set the password
      </Button>
    </form>
  );
}

/** The signed-in person's own password; the other places they are signed in are signed out. */
export function ChangePasswordForm() {
  const [currentPassword, setCurrent] = useState("");
  const [newPassword, setNew] = useState("");
  const [errors, setErrors] = useState<FieldErrors>({});
  const [done, setDone] = useState(false);
  const change = useChangePassword();

  function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    setDone(false);
    const parsed = parseForm(ChangePasswordSchema, { currentPassword, newPassword });
    if (!parsed.ok) return setErrors(parsed.errors);
    setErrors({});
    change.mutate(parsed.data, {
      onSuccess: () => {
        setDone(true);
        setCurrent("");
        setNew("");
      },
      onError: (e) => setErrors(serverFieldErrors(e)),
    });
  }

  return (
    <form onSubmit={submit} noValidate aria-label="Change password" className="max-w-sm space-y-4">
      {errors._form ? <Alert>{errors._form}</Alert> : null}
      {done ? <Alert tone="info">Password changed. You were signed out everywhere else.</Alert> : null}
      <PasswordInput
        name="currentPassword"
        label="Current password"
        autoComplete="current-password"
        value={currentPassword}
        onChange={setCurrent}
        error={errors.currentPassword}
      />
      <PasswordInput
        name="newPassword"
        label="New password"
        hint="At least 10 characters."
        autoComplete="new-password"
        value={newPassword}
        onChange={setNew}
        error={errors.newPassword}
      />
      <Button type="submit" variant="primary" pending={change.isPending}>
        Change password
      </Button>
    </form>
  );
}

/** The name colleagues see on activity and reviews. */
export function NameForm({ current }: { current: string }) {
  const [name, setName] = useState(current);
  const [errors, setErrors] = useState<FieldErrors>({});
  const update = useUpdateName();

  function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const parsed = parseForm(AccountUpdateSchema, { name });
    if (!parsed.ok) return setErrors(parsed.errors);
    setErrors({});
    update.mutate(parsed.data.name, { onError: (e) => setErrors(serverFieldErrors(e)) });
  }

  return (
    <form onSubmit={submit} noValidate aria-label="Your name" className="max-w-sm space-y-4">
      {errors._form ? <Alert>{errors._form}</Alert> : null}
      <Field label="Your name" error={errors.name}>
        {({ id, describedBy, invalid }) => (
          <Input
            id={id}
            name="name"
            autoComplete="name"
            value={name}
            invalid={invalid}
            aria-describedby={describedBy}
            onChange={(e) => setName(e.target.value)}
          />
        )}
      </Field>
      <Button type="submit" variant="secondary" pending={update.isPending} disabled={name.trim() === current}>
        Save name
      </Button>
    </form>
  );
}
