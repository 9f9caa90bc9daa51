import { useState, type FormEvent } from "react";
import { AcceptInvitationSchema } from "@shared/schemas/api";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { Field, Input } from "@frontend/components/ui/field";
import { parseForm, serverFieldErrors, type FieldErrors } from "@frontend/lib/form";
import { useAcceptInvitation } from "../api/accept-invitation";
import type { InvitationPreview } from "../api/get-invitation-preview";

export function AcceptInvitationForm({
  token,
  invitation,
  onAccepted,
}: {
  token: string;
  invitation: InvitationPreview;
  onAccepted: () => void;
}) {
  const [name, setName] = useState("");
  const [password, setPassword] = useState("");
  const [errors, setErrors] = useState<FieldErrors>({});
  const accept = useAcceptInvitation();

  function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const parsed = parseForm(AcceptInvitationSchema, { name, password });
    if (!parsed.ok) return setErrors(parsed.errors);
    setErrors({});
    accept.mutate({ token, input: parsed.data }, { onSuccess: onAccepted, onError: (error) => setErrors(serverFieldErrors(error)) });
  }

  return (
    <form onSubmit={submit} noValidate aria-label="Accept invitation" className="space-y-4">
      {errors._form ? <Alert>{errors._form}</Alert> : null}
      <Field label="E-mail address">
        {({ id }) => <Input id={id} type="email" value={invitation.email} readOnly disabled autoComplete="username" />}
      </Field>
      <Field label="Your name" error={errors.name} hint="Shown to your colleagues on activity and reviews.">
        {({ id, describedBy, invalid }) => (
          <Input
            id={id}
            name="name"
            autoComplete="name"
            autoFocus
            value={name}
            invalid={invalid}
            aria-describedby={describedBy}
            onChange={(e) => setName(e.target.value)}
          />
        )}
      </Field>
      <Field label="Choose a password" error={errors.password} hint="At least 10 characters.">
        {({ id, describedBy, invalid }) => (
          <Input
            id={id}
            name="password"
            type="password"
            autoComplete="new-password"
            value={password}
            invalid={invalid}
            aria-describedby={describedBy}
            onChange={(e) => setPassword(e.target.value)}
          />
        )}
      </Field>
      <Button type="submit" variant="primary" className="w-full" pending={accept.isPending}>
        Join {invitation.workspaceName}
      </Button>
    </form>
  );
}
