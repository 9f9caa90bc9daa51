import { Link } from "react-router";

export function NotFoundContent({
  title = "Page not found",
  message = "There is nothing at this address. It may have moved, or the link was mistyped.",
  code = "404",
}: {
  title?: string;
  message?: string;
  code?: string;
}) {
  return (
    <div className="mx-auto flex max-w-lg flex-col items-center py-20 text-center">
      <p className="font-mono text-xs font-bold tracking-[0.2em] text-mag">{code}</p>
      <h1 className="mt-2 text-[22px] leading-7 font-extrabold tracking-[-0.015em] text-ink">{title}</h1>
      <p className="mt-2 text-[13px] text-ink/65">{message}</p>
      <Link
        to="/"
        className="mt-6 inline-flex h-8.5 items-center rounded-md border border-ink bg-ink px-3.5 text-[13px] font-semibold text-paper hover:bg-ink/90"
      >
        Back to the start page
      </Link>
    </div>
  );
}

/** The catch-all route inside the shell. */
export function NotFoundRoute() {
  return <NotFoundContent />;
}
