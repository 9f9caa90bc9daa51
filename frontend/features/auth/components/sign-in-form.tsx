import { zodResolver } from "@hookform/resolvers/zod";
import { useForm } from "react-hook-form";
import * as z from "zod";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { Field, Input } from "@frontend/components/ui/field";
import { isApiError } from "@frontend/lib/api-client";
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
  const {
    register,
    handleSubmit,
    formState: { errors },
  } = useForm({ resolver: zodResolver(SignInFormSchema), defaultValues: { email: defaultEmail, password: defaultPassword } });
  const signIn = useSignIn();

  return (
    <form
      onSubmit={handleSubmit((data) => signIn.mutate(data, { onSuccess: onSignedIn }))}
      noValidate
      aria-label="Sign in"
      className="space-y-4"
    >
      {signIn.error ? (
        <Alert title={isApiError(signIn.error) && signIn.error.status === 429 ? "Slow down" : "Could not sign in"}>
          {signIn.error.message}
        </Alert>
      ) : null}
      <Field label="E-mail address" error={errors.email?.message}>
        {({ id, describedBy, invalid }) => (
          <Input
            id={id}
            type="email"
            autoComplete="username"
            autoFocus
            invalid={invalid}
            aria-describedby={describedBy}
            {...register("email")}
          />
        )}
      </Field>
      <Field label="Password" error={errors.password?.message}>
        {({ id, describedBy, invalid }) => (
          <Input
            id={id}
            type="password"
            autoComplete="current-password"
            invalid={invalid}
            aria-describedby={describedBy}
            {...register("password")}
          />
        )}
      </Field>
      <Button type="submit" variant="primary" className="w-full" pending={signIn.isPending}>
        Sign in
      </Button>
    </form>
  );
}
