import { useEffect, useRef, useState } from "react";
import type { QueryClient } from "@tanstack/react-query";
import { useSearchParams, type LoaderFunctionArgs } from "react-router";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { EmptyState } from "@frontend/components/ui/empty-state";
import { Input, Select } from "@frontend/components/ui/field";
import { PlusIcon, ProjectsIcon, SearchIcon } from "@frontend/components/ui/icons";
import { PageHeader } from "@frontend/components/ui/page-header";
import { Spinner } from "@frontend/components/ui/spinner";
import { useMe } from "@frontend/features/auth/api/get-me";
import { projectsQueryOptions, useProjects } from "@frontend/features/projects/api/get-projects";
import type { ProjectShown } from "@frontend/features/projects/api/keys";
import { CreateProjectDialog } from "@frontend/features/projects/components/project-form-dialog";
import { ProjectsTable } from "@frontend/features/projects/components/projects-table";
import { useReviewQueue } from "@frontend/features/review-queue";
import { can } from "@frontend/lib/permissions";
import { requirePermission } from "../../route-guards";

/** `?archived=only|all` in the address; anything else shows the open projects. */
const shownOf = (value: string | null): ProjectShown => (value === "only" || value === "all" ? value : "open");

const SHOWN_LABELS: Record<ProjectShown, string> = { open: "Open projects", only: "Archived projects", all: "Open and archived" };

export const projectsLoader =
  (queryClient: QueryClient) =>
  async ({ request }: LoaderFunctionArgs) => {
    const params = new URL(request.url).searchParams;
    const q = params.get("q") ?? "";
    await Promise.all([
      requirePermission(queryClient, request, "projects.read"),
      queryClient.ensureQueryData(projectsQueryOptions(q, shownOf(params.get("archived")))),
    ]);
    return null;
  };

const SEARCH_DELAY_MS = 250;

export function ProjectsRoute() {
  const me = useMe();
  const canWrite = can(me.role, "projects.write");
  const [searchParams, setSearchParams] = useSearchParams();
  const q = searchParams.get("q") ?? "";
  const shown = shownOf(searchParams.get("archived"));
  const [draft, setDraft] = useState(q);
  const [creating, setCreating] = useState(false);
  const projects = useProjects(q, shown);
  const queue = useReviewQueue(can(me.role, "reviews.read"));
  const awaiting = Object.fromEntries((queue.data?.awaitingReview ?? []).map((a) => [a.projectId, a]));

  function show(next: ProjectShown) {
    setSearchParams(
      (prev) => {
        const params = new URLSearchParams(prev);
        if (next === "open") params.delete("archived");
        else params.set("archived", next);
        return params;
      },
      { replace: true },
    );
  }

  // The value this page last wrote to the URL; any other change came from outside
  // (back button, a link) and replaces what is in the box.
  const written = useRef(q);
  useEffect(() => {
    if (q !== written.current) {
      written.current = q;
      setDraft(q);
    }
  }, [q]);

  useEffect(() => {
    if (draft.trim() === written.current) return;
    const t = window.setTimeout(() => {
      written.current = draft.trim();
      setSearchParams(
        (prev) => {
          const next = new URLSearchParams(prev);
          if (draft.trim()) next.set("q", draft.trim());
          else next.delete("q");
          return next;
        },
        { replace: true },
      );
    }, SEARCH_DELAY_MS);
    return () => window.clearTimeout(t);
  }, [draft, setSearchParams]);

  const rows = projects.data ?? [];
  const searching = projects.isFetching && projects.isPlaceholderData;

  return (
    <>
      <PageHeader
        title="Projects"
        description="One project per package: its stack revisions, tolerance studies, first-build data and supplier reports."
        actions={
          canWrite ? (
            <Button variant="primary" icon={<PlusIcon />} onClick={() => setCreating(true)}>
              New project
            </Button>
          ) : null
        }
      />

      <div className="mb-3 flex items-center justify-between gap-3">
        <div className="relative w-full max-w-sm">
          <SearchIcon className="pointer-events-none absolute top-1/2 left-2.5 -translate-y-1/2 text-ink/40" />
          <Input
            type="search"
            aria-label="Search projects"
            placeholder="Search by name or description"
            value={draft}
            onChange={(e) => setDraft(e.target.value)}
            className="pl-8"
          />
          {searching ? <Spinner size={12} className="absolute top-1/2 right-2.5 -translate-y-1/2 text-ink/40" /> : null}
        </div>
        <div className="flex items-center gap-3">
          <p className="text-xs text-ink/55 tabular-nums" aria-live="polite">
            {projects.isSuccess
              ? `${rows.length} ${shown === "only" ? "archived " : ""}${rows.length === 1 ? "project" : "projects"}${q ? ` matching “${q}”` : ""}`
              : ""}
          </p>
          <Select aria-label="Show" compact value={shown} onChange={(e) => show(e.target.value as ProjectShown)} className="w-44">
            {(Object.keys(SHOWN_LABELS) as ProjectShown[]).map((k) => (
              <option key={k} value={k}>
                {SHOWN_LABELS[k]}
              </option>
            ))}
          </Select>
        </div>
      </div>

      {projects.isError ? (
        <Alert title="Projects could not be loaded">{projects.error.message}</Alert>
      ) : rows.length === 0 && projects.isSuccess ? (
        <div className="rounded-lg border border-dashed border-line bg-panel">
          {shown === "only" && !q ? (
            <EmptyState icon={<ProjectsIcon />} title="No archived projects">
              A project archived from the list or its page shows here, read-only, until it is restored.
            </EmptyState>
          ) : q ? (
            <EmptyState icon={<SearchIcon />} title={`No project matches “${q}”`}>
              Try part of the product name, or clear the search.
              <div className="mt-3">
                <Button size="sm" onClick={() => setDraft("")}>
                  Clear search
                </Button>
              </div>
            </EmptyState>
          ) : (
            <EmptyState
              icon={<ProjectsIcon />}
              title="No projects yet"
              action={
                canWrite ? (
                  <Button variant="primary" icon={<PlusIcon />} onClick={() => setCreating(true)}>
                    New project
                  </Button>
                ) : null
              }
            >
              {canWrite
                ? "Start with the product's package; stack revisions and studies come next."
                : "Projects appear here once an engineer creates one."}
            </EmptyState>
          )}
        </div>
      ) : (
        <ProjectsTable projects={rows} canWrite={canWrite} awaiting={awaiting} />
      )}

      {canWrite ? <CreateProjectDialog open={creating} onClose={() => setCreating(false)} /> : null}
    </>
  );
}
