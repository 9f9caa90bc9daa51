import { isRouteErrorResponse, useRouteError } from "react-router";
import { isApiError } from "@frontend/lib/api-client";
import { InvitationInvalid } from "./accept-invitation";
import { NotFoundContent } from "./not-found";

function messageOf(data: unknown): string | undefined {
  if (data && typeof data === "object" && "message" in data && typeof data.message === "string") return data.message;
  return undefined;
}

/**
 * The errorElement of every route: a plain explanation and a way back, never a stack
 * trace. Loaders throw `data(.., { status })` for 403 and 404; anything else is a fault.
 */
export function RouteError() {
  const error = useRouteError();
  const status = isRouteErrorResponse(error) ? error.status : isApiError(error) ? error.status : 500;
  const detail = isRouteErrorResponse(error) ? messageOf(error.data) : isApiError(error) ? error.message : undefined;

  if (status === 404) return <NotFoundContent title="Not found" message={detail ?? "This item does not exist, or it was removed."} />;
  if (status === 403)
    return (
      <NotFoundContent
        code="403"
        title="Not available for your role"
        message={detail ?? "Your role in this workspace does not give access to this page. An admin can change roles."}
      />
    );
  return (
    <div className="mx-auto flex max-w-lg flex-col items-center py-20 text-center" role="alert">
      <p className="font-mono text-xs font-bold tracking-[0.2em] text-fail">ERROR</p>
      <h1 className="mt-2 text-[22px] leading-7 font-extrabold tracking-[-0.015em] text-ink">Something went wrong</h1>
      <p className="mt-2 text-[13px] text-ink/65">
        {isApiError(error) && error.status === 0
          ? error.message
          : "This page could not be shown. Your work is saved on the server; reloading usually helps."}
      </p>
      <div className="mt-6 flex gap-2">
        <button
          type="button"
          onClick={() => window.location.reload()}
          className="inline-flex h-8.5 items-center rounded-md border border-ink bg-ink px-3.5 text-[13px] font-semibold text-paper hover:bg-ink/90"
        >
          Reload
        </button>
        <a
          href="/"
          className="inline-flex h-8.5 items-center rounded-md border border-line bg-panel px-3.5 text-[13px] font-semibold text-ink hover:border-ink/30"
        >
          Start page
        </a>
      </div>
    </div>
  );
}

/** Root-level boundary (outside the shell): the same message on a full page. */
export function RootError() {
  return (
    <div className="min-h-dvh bg-paper px-6">
      <RouteError />
    </div>
  );
}

export function InvitationError() {
  const error = useRouteError();
  if (isRouteErrorResponse(error) && error.status === 404) return <InvitationInvalid />;
  return <RootError />;
}
