import type { QueryClient } from "@tanstack/react-query";
import { Link, redirect, type LoaderFunctionArgs } from "react-router";
import type { ReviewQueue } from "@shared/schemas/review-queue";
import { Alert } from "@frontend/components/ui/alert";
import { PageHeader } from "@frontend/components/ui/page-header";
import { Spinner } from "@frontend/components/ui/spinner";
import { useMe } from "@frontend/features/auth/api/get-me";
import { reviewQueueQueryOptions, useReviewQueue, WaitingList } from "@frontend/features/review-queue";
import { can, homePath } from "@frontend/lib/permissions";
import { requireMe } from "../../route-guards";

/** `/`: the staff's home, what waits for them; a supplier's work starts at its reports. */
export const homeLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    const me = await requireMe(queryClient, request);
    if (!can(me.role, "reviews.read")) return redirect(homePath(me.role));
    await queryClient.ensureQueryData(reviewQueueQueryOptions());
    return null;
  };

const count = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;

/** "2 revisions and 1 report wait for review" (the reviewer's first line), or nothing when none does. */
export function reviewSummary(items: ReviewQueue["items"]): string {
  const revisions = items.filter((i) => i.kind === "revision.review").length;
  const reports = items.filter((i) => i.kind === "report.release").length;
  const parts = [revisions ? count(revisions, "revision", "revisions") : "", reports ? count(reports, "report", "reports") : ""].filter(
    Boolean,
  );
  if (!parts.length) return "";
  return `${parts.join(" and ")} ${revisions + reports === 1 ? "waits" : "wait"} for ${revisions ? "review" : "release"}${revisions && reports ? " or release" : ""}.`;
}

export function HomeRoute() {
  const me = useMe();
  const queue = useReviewQueue();
  const reviews = can(me.role, "revisions.review") || can(me.role, "reports.release");
  const summary = queue.data ? reviewSummary(queue.data.items) : "";
  return (
    <>
      <PageHeader
        title="Waiting for you"
        description={
          reviews
            ? "Revisions submitted for review and report drafts ready for release, the longest waiting first."
            : "Your revisions and report drafts sent back, and supplier questions on your reports not yet answered."
        }
        actions={
          <Link to="/projects" className="text-[13px] font-semibold text-ink/70 hover:text-ink hover:underline">
            All projects
          </Link>
        }
      />
      {summary ? <p className="mb-4 text-[13px] font-semibold text-ink">{summary}</p> : null}
      {queue.isError ? (
        <Alert title="What waits for you could not be loaded">{queue.error.message}</Alert>
      ) : queue.data ? (
        <WaitingList items={queue.data.items} />
      ) : (
        <Spinner />
      )}
    </>
  );
}
