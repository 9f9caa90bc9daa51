import { useState } from "react";
import { Link, useSearchParams } from "react-router";
import { ResetPasswordForm } from "@frontend/features/auth/components/password-forms";
import { AuthFrame } from "../shell/auth-frame";

/** Where an admin's reset link lands: choose a new password, then sign in with it. */
export function ResetPasswordRoute() {
  const [searchParams] = useSearchParams();
  const token = searchParams.get("token") ?? "";
  const [done, setDone] = useState(false);

  return (
    <AuthFrame>
      <h1 className="text-[22px] leading-7 font-extrabold tracking-[-0.015em] text-ink">{done ? "Password set" : "Set a new password"}</h1>
      {done ? (
        <p className="mt-2 text-[13px] text-ink/65">
          Your new password is in place and every earlier session has ended.{" "}
          <Link to="/sign-in" className="font-bold text-gyro hover:underline">
            Sign in
          </Link>{" "}
          with it.
        </p>
      ) : token ? (
        <>
          <p className="mt-1 mb-6 text-[13px] text-ink/60">Your admin sent you this link. It works once.</p>
          <ResetPasswordForm token={token} onDone={() => setDone(true)} />
        </>
      ) : (
        <p className="mt-2 text-[13px] text-ink/65">This link is incomplete. Ask your workspace admin to send a new one.</p>
      )}
    </AuthFrame>
  );
}
