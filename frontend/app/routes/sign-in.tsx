import { useState } from "react";
import type { QueryClient } from "@tanstack/react-query";
import { redirect, useNavigate, useSearchParams, type LoaderFunctionArgs } from "react-router";
import { meQueryOptions } from "@frontend/features/auth/api/get-me";
import { SignInForm } from "@frontend/features/auth/components/sign-in-form";
import { isApiError } from "@frontend/lib/api-client";
import { homePath } from "@frontend/lib/permissions";
import { safeNext } from "../route-guards";
import { AuthFrame } from "../shell/auth-frame";

export const signInLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    // Ask the server, not the cache: the cache may still hold the member who just signed out.
    try {
      const me = await queryClient.fetchQuery({ ...meQueryOptions(), staleTime: 0 });
      const next = safeNext(new URL(request.url).searchParams.get("next"));
      return redirect(next ?? homePath(me.role));
    } catch (error) {
      if (isApiError(error) && error.status === 401) return null;
      throw error;
    }
  };

const DEMO_PASSWORD = "orthostack-demo";
const DEMO_ACCOUNTS = [
  { email: "admin@example.com", role: "Admin" },
  { email: "engineer@example.com", role: "Engineer" },
  { email: "reviewer@example.com", role: "Reviewer" },
  { email: "supplier@example.com", role: "Supplier" },
];

export function SignInRoute() {
  const navigate = useNavigate();
  const [searchParams] = useSearchParams();
  const next = safeNext(searchParams.get("next"));
  const [prefill, setPrefill] = useState<string | null>(null);

  return (
    <AuthFrame>
      <h1 className="text-[22px] leading-7 font-extrabold tracking-[-0.015em] text-ink">Sign in</h1>
      <p className="mt-1 mb-6 text-[13px] text-ink/60">Use the e-mail address your workspace admin invited.</p>
      <SignInForm
        key={prefill ?? ""}
        defaultEmail={prefill ?? ""}
        defaultPassword={prefill ? DEMO_PASSWORD : ""}
        onSignedIn={() => navigate(next ?? "/", { replace: true })}
      />
      <p className="mt-3 text-xs text-ink/55">Forgot your password? Your workspace admin can send you a link to set a new one.</p>

      <section aria-labelledby="demo-heading" className="mt-8 rounded-lg border border-line bg-panel">
        <header className="flex items-baseline justify-between border-b border-line px-3.5 py-2">
          <h2 id="demo-heading" className="text-xs font-bold text-ink">
            Demo workspace
          </h2>
          <span className="text-2xs text-ink/50">
            password <code className="font-mono text-[11px] font-semibold text-ink/75">{DEMO_PASSWORD}</code>
          </span>
        </header>
        <ul className="divide-y divide-line/70 text-xs">
          {DEMO_ACCOUNTS.map((a) => (
            <li key={a.email}>
              <button
                type="button"
                onClick={() => setPrefill(a.email)}
                title={`Fill in ${a.email}`}
                className="group flex w-full items-center justify-between px-3.5 py-1.5 text-left hover:bg-paper"
              >
                <code className="font-mono text-[11px] text-ink/80">{a.email}</code>
                <span className="text-ink/50 group-hover:text-gyro">{a.role}</span>
              </button>
            </li>
          ))}
        </ul>
      </section>
    </AuthFrame>
  );
}
