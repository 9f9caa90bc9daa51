import { useState } from "react";
import type { QueryClient } from "@tanstack/react-query";
import { useQuery, useSuspenseQuery } from "@tanstack/react-query";
import { data, Link, useNavigate, useParams, useSearchParams, type LoaderFunctionArgs } from "react-router";
import { IdSchema } from "@shared/schemas/common";
import { ChevronLeftIcon } from "@frontend/components/ui/icons";
import { PageHeader } from "@frontend/components/ui/page-header";
import { EmptyState } from "@frontend/components/ui/empty-state";
import { ArchivedProjectNotice, isArchived } from "@frontend/features/projects";
import { projectQueryOptions, useProject } from "@frontend/features/projects/api/get-project";
import { projectRevisionsQueryOptions } from "@frontend/features/studies/api/get-project-revisions";
import { studiesQueryOptions } from "@frontend/features/studies/api/get-studies";
import { studyQueryOptions } from "@frontend/features/studies/api/get-study";
import { StudySettingsForm } from "@frontend/features/studies/components/study-settings-form";
import { defaultFormValues, formValuesFromStudy } from "@frontend/features/studies/lib/study-form";
import { isApiError } from "@frontend/lib/api-client";
import { requirePermission } from "../../route-guards";
import { useMe } from "@frontend/features/auth/api/get-me";
import { can } from "@frontend/lib/permissions";

const notFound = () => data({ message: "This project does not exist, or it was deleted." }, { status: 404 });

export const studyNewRoute = (queryClient: QueryClient) => ({
  loader: async ({ request, params }: LoaderFunctionArgs) => {
    const id = IdSchema.safeParse(params.id);
    if (!id.success) throw notFound();
    const from = IdSchema.safeParse(new URL(request.url).searchParams.get("from"));
    try {
      const [, , , studies] = await Promise.all([
        requirePermission(queryClient, request, "studies.run"),
        queryClient.ensureQueryData(projectQueryOptions(id.data)),
        queryClient.ensureQueryData(projectRevisionsQueryOptions(id.data)),
        queryClient.ensureQueryData(studiesQueryOptions(id.data)),
        from.success ? queryClient.ensureQueryData(studyQueryOptions(from.data)).catch(() => null) : null,
      ]);
      const newest = studies[0];
      if (!from.success && newest && new URL(request.url).searchParams.get("from") !== "none") {
        await queryClient.ensureQueryData(studyQueryOptions(newest.id)).catch(() => null);
      }
    } catch (error) {
      if (isApiError(error) && error.status === 404) throw notFound();
      throw error;
    }
    return null;
  },
  Component: StudyNewRoute,
});

export function StudyNewRoute() {
  const { id = "" } = useParams();
  const [params] = useSearchParams();
  const navigate = useNavigate();
  const me = useMe();
  const { data: project } = useProject(id);
  const { data: revisions } = useSuspenseQuery(projectRevisionsQueryOptions(id));
  const { data: studies } = useSuspenseQuery(studiesQueryOptions(id));
  // Without a choice in the address the form starts from the project's newest study;
  // "from=none" starts from the defaults.
  const fromParam = params.get("from");
  // Taken once: the list refreshes when the new study is queued, and the form must not start over then.
  const [newestId] = useState(() => studies[0]?.id ?? null);
  const fromId = fromParam === "none" ? null : (fromParam ?? newestId);
  const from = useQuery({ ...studyQueryOptions(fromId ?? ""), enabled: !!fromId });
  const source = from.data && from.data.projectId === id ? from.data : null;

  const wanted = params.get("revision");
  const initialRevision = revisions.find((r) => r.id === wanted) ?? revisions.find((r) => r.status === "approved") ?? revisions[0] ?? null;

  return (
    <>
      <Link to={`/projects/${project.id}`} className="mb-3 inline-flex items-center gap-1 text-xs font-semibold text-ink/55 hover:text-ink">
        <ChevronLeftIcon size={14} /> {project.name}
      </Link>
      <PageHeader
        title="New study"
        description="A Monte Carlo run of one stack revision: how many units meet each requirement, what drives the misses, and where the heading error goes."
      />
      {isArchived(project) ? (
        // an archived project is read-only: the server refuses a new study under it
        <ArchivedProjectNotice project={project} toDo="run a study" />
      ) : initialRevision === null ? (
        <EmptyState title="No stack revision yet">A study runs on a stack revision. Add the stack first, then come back.</EmptyState>
      ) : fromId && from.isPending ? null : (
        <StudySettingsForm
          // A different source study or revision in the address starts the form afresh.
          key={`${source?.id ?? "new"}:${initialRevision.id}`}
          revisions={revisions}
          initialRevisionId={initialRevision.id}
          initialValues={source ? formValuesFromStudy(source.study, source.site, "") : defaultFormValues()}
          startedFrom={source ? `study ${source.number}${source.label ? ` (${source.label})` : ""}` : undefined}
          defaultsHref={source ? `/projects/${project.id}/studies/new?revision=${initialRevision.id}&from=none` : undefined}
          canSetBudget={can(me.role, "workspace.settings")}
          onStarted={(s) => navigate(`/projects/${project.id}/studies/${s.id}`)}
        />
      )}
    </>
  );
}
