import type { QueryClient } from "@tanstack/react-query";
import { useSuspenseQuery } from "@tanstack/react-query";
import { data, Link, useParams, useSearchParams, type LoaderFunctionArgs } from "react-router";
import { IdSchema } from "@shared/schemas/common";
import { ChevronLeftIcon } from "@frontend/components/ui/icons";
import { PageHeader } from "@frontend/components/ui/page-header";
import { Spinner } from "@frontend/components/ui/spinner";
import { useMe } from "@frontend/features/auth/api/get-me";
import { projectQueryOptions, useProject } from "@frontend/features/projects/api/get-project";
import { projectRevisionsQueryOptions } from "@frontend/features/studies/api/get-project-revisions";
import { studiesQueryOptions, useStudies } from "@frontend/features/studies/api/get-studies";
import { studyQueryOptions, useStudy } from "@frontend/features/studies/api/get-study";
import { CompareView } from "@frontend/features/studies/components/compare-view";
import { isApiError } from "@frontend/lib/api-client";
import { can } from "@frontend/lib/permissions";
import { requirePermission } from "../../route-guards";

const notFound = () => data({ message: "This project does not exist, or it was deleted." }, { status: 404 });

export const compareRoute = (queryClient: QueryClient) => ({
  loader: async ({ request, params }: LoaderFunctionArgs) => {
    const id = IdSchema.safeParse(params.id);
    if (!id.success) throw notFound();
    const search = new URL(request.url).searchParams;
    const sides = [search.get("a"), search.get("b")]
      .map((v) => IdSchema.safeParse(v))
      .filter((r) => r.success)
      .map((r) => r.data!);
    try {
      await Promise.all([
        requirePermission(queryClient, request, "projects.read"),
        queryClient.ensureQueryData(projectQueryOptions(id.data)),
        queryClient.ensureQueryData(studiesQueryOptions(id.data)),
        queryClient.ensureQueryData(projectRevisionsQueryOptions(id.data)),
        // A study that is gone shows as "choose a study", not as an error page.
        ...sides.map((s) => queryClient.ensureQueryData(studyQueryOptions(s)).catch(() => null)),
      ]);
    } catch (error) {
      if (isApiError(error) && error.status === 404) throw notFound();
      throw error;
    }
    return null;
  },
  Component: CompareRoute,
});

export function CompareRoute() {
  const { id = "" } = useParams();
  const [params, setParams] = useSearchParams();
  const me = useMe();
  const { data: project } = useProject(id);
  const { data: revisions } = useSuspenseQuery(projectRevisionsQueryOptions(id));
  const studies = useStudies(id);
  const aId = params.get("a");
  const bId = params.get("b");
  const a = useStudy(aId);
  const b = useStudy(bId);
  const mine = (s: typeof a.data) => (s && s.projectId === id ? s : null);

  return (
    <>
      <Link to={`/projects/${project.id}`} className="mb-3 inline-flex items-center gap-1 text-xs font-semibold text-ink/55 hover:text-ink">
        <ChevronLeftIcon size={14} /> {project.name}
      </Link>
      <PageHeader
        title="Compare studies"
        description="Two studies side by side: their settings, how each requirement and percentile moved, the heading envelopes overlaid, and the tolerances that differ."
      />
      {(aId && a.isPending) || (bId && b.isPending) ? (
        <p className="flex items-center gap-2 text-[13px] text-ink/55">
          <Spinner /> Loading the studies…
        </p>
      ) : (
        <CompareView
          studies={studies.data ?? []}
          revisions={revisions}
          a={mine(a.data)}
          b={mine(b.data)}
          canRun={can(me.role, "studies.run")}
          onPick={(side, value) =>
            setParams(
              (prev) => {
                const next = new URLSearchParams(prev);
                if (value) next.set(side, value);
                else next.delete(side);
                return next;
              },
              { replace: false },
            )
          }
        />
      )}
    </>
  );
}
