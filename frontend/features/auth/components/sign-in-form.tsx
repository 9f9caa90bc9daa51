import { useState, type FormEvent } from "react";
import { z } from "zod";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { Field, Input } from "@frontend/components/ui/field";
import { isApiError } from "@frontend/lib/api-client";
import { parseForm, type FieldErrors } from "@frontend/lib/form";
import { useSignIn } from "../api/sign-in";

const SignInFormSchema = z.object({
  email: z.string().trim().min(1, { message: "Enter your e-mail address" }).email({ message: "That is not an e-mail address" }),
  password: z.string().min(1, { message: "Enter your password" }),
});

export function SignInForm({
  onSignedIn,
  defaultEmail = "",
  defaultPassword = "",
}: {
  onSignedIn: () => void;
  defaultEmail?: string;
  defaultPassword?: string;
}) {
  const [email, setEmail] = useState(defaultEmail);
  const [password, setPassword] = useState(defaultPassword);
  const [errors, setErrors] = useState<FieldErrors>({});
  const signIn = useSignIn();

  function submit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const parsed = parseForm(SignInFormSchema, { email, password });
    if (!parsed.ok) return setErrors(parsed.errors);
    setErrors({});
    signIn.mutate(parsed.data, { onSuccess: onSignedIn });
  }

  return (
    <form onSubmit={submit} noValidate aria-label="Sign in" className="space-y-4">
      {signIn.error ? (
        <Alert title={isApiError(signIn.error) && signIn.error.status === 429 ? "Slow down" : "Could not sign in"}>
          {signIn.error.message}
        </Alert>
      ) : null}
      <Field label="E-mail address" error={errors.email}>
        {({ id, describedBy, invalid }) => (
          <Input
            id={id}
            name="email"
            type="email"
            autoComplete="username"
            autoFocus
            value={email}
            invalid={invalid}
            aria-describedby={describedBy}
            onChange={(e) => setEmail(e.target.value)}
          />
        )}
      </Field>
      <Field label="Password" error={errors.password}>
        {({ id, describedBy, invalid }) => (
          <Input
            id={id}
            name="password"
            type="password"
            autoComplete="current-password"
            value={password}
            invalid={invalid}
            aria-describedby={describedBy}
            onChange={(e) => setPassword(e.target.value)}
          />
        )}
      </Field>
      <Button type="submit" variant="primary" className="w-full" pending={signIn.isPending}>
        Sign in
      </Button>
    </form>
  );
}
