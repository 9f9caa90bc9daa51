import { zodResolver } from "@hookform/resolvers/zod";
import { useForm } from "react-hook-form";
import { AcceptInvitationSchema } from "@shared/schemas/api";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { Field, Input } from "@frontend/components/ui/field";
import { setServerErrors } from "@frontend/lib/form";
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
  const form = useForm({ resolver: zodResolver(AcceptInvitationSchema), defaultValues: { name: "", password: "" } });
  const { errors } = form.formState;
  const accept = useAcceptInvitation();

  const submit = form.handleSubmit((input) =>
    accept.mutate({ token, input }, { onSuccess: onAccepted, onError: (error) => setServerErrors(form, error) }),
  );

  return (
    <form onSubmit={submit} noValidate aria-label="Accept invitation" className="space-y-4">
      {errors.root?.server ? <Alert>{errors.root.server.message}</Alert> : null}
      <Field label="E-mail address">
        {({ id }) => <Input id={id} type="email" value={invitation.email} readOnly disabled autoComplete="username" />}
      </Field>
      <Field label="Your name" error={errors.name?.message} hint="Shown to your colleagues on activity and reviews.">
        {({ id, describedBy, invalid }) => (
          <Input id={id} autoComplete="name" autoFocus invalid={invalid} aria-describedby={describedBy} {...form.register("name")} />
        )}
      </Field>
      <Field label="Choose a password" error={errors.password?.message} hint="At least 10 characters.">
        {({ id, describedBy, invalid }) => (
          <Input
            id={id}
            type="password"
            autoComplete="new-password"
            invalid={invalid}
            aria-describedby={describedBy}
            {...form.register("password")}
          />
        )}
      </Field>
      <Button type="submit" variant="primary" className="w-full" pending={accept.isPending}>
        Join {invitation.workspaceName}
      </Button>
    </form>
  );
}
