import { useState, type ReactNode } from "react";
import type { QueryClient } from "@tanstack/react-query";
import { data, Link, useNavigate, useParams, useSearchParams, type LoaderFunctionArgs } from "react-router";
import { IdSchema } from "@shared/schemas/common";
import { Badge } from "@frontend/components/ui/badge";
import { Button } from "@frontend/components/ui/button";
import { ConfirmDialog } from "@frontend/components/ui/confirm-dialog";
import { ChevronLeftIcon, TrashIcon } from "@frontend/components/ui/icons";
import { Panel } from "@frontend/components/ui/panel";
import { useMe } from "@frontend/features/auth/api/get-me";
import { datasetQueryOptions, useDataset } from "@frontend/features/datasets/api/get-dataset";
import { useDeleteDataset } from "@frontend/features/datasets/api/delete-dataset";
import { AsBuiltDialog } from "@frontend/features/datasets/components/as-built-dialog";
import { CapabilityView } from "@frontend/features/datasets/components/capability-view";
import { ColumnMapping } from "@frontend/features/datasets/components/column-mapping";
import { DatasetPreview } from "@frontend/features/datasets/components/dataset-preview";
import { ArchivedProjectNotice, isArchived } from "@frontend/features/projects";
import { projectQueryOptions, useProject } from "@frontend/features/projects/api/get-project";
import { isApiError } from "@frontend/lib/api-client";
import { formatDateTime } from "@frontend/lib/format";
import { can } from "@frontend/lib/permissions";
import { requirePermission } from "../../route-guards";
import { formatBytes, formatCount } from "@shared/format";
import { reportNumber } from "@shared/reports/format";

const notFound = () => data({ message: "This data set does not exist, or it was deleted." }, { status: 404 });

export const datasetRoute = (queryClient: QueryClient) => ({
  loader: async ({ request, params }: LoaderFunctionArgs) => {
    const projectId = IdSchema.safeParse(params.id);
    const datasetId = IdSchema.safeParse(params.datasetId);
    if (!projectId.success || !datasetId.success) throw notFound();
    try {
      const [, , dataset] = await Promise.all([
        requirePermission(queryClient, request, "projects.read"),
        queryClient.ensureQueryData(projectQueryOptions(projectId.data)),
        queryClient.ensureQueryData(datasetQueryOptions(datasetId.data)),
      ]);
      if (dataset.projectId !== projectId.data) throw notFound();
    } catch (error) {
      if (isApiError(error) && error.status === 404) throw notFound();
      throw error;
    }
    return null;
  },
  Component: DatasetRoute,
});

/** One data set: who sent it, its first rows, which tolerance each column measures, and its capability. */
export function DatasetRoute() {
  const { id = "", datasetId = "" } = useParams();
  const { data: project } = useProject(id);
  const { data: dataset } = useDataset(datasetId);
  const me = useMe();
  // an archived project is read-only (the server refuses the change): no mapping, delete or run here
  const open = !isArchived(project);
  const canWrite = open && can(me.role, "datasets.write");
  const canRun = open && can(me.role, "studies.run");
  const [params, setParams] = useSearchParams();
  const numeric = dataset.columns.filter((c) => c.kind === "number");
  const column = numeric.find((c) => c.key === params.get("column"))?.key ?? numeric.find((c) => c.mapping)?.key ?? numeric[0]?.key ?? "";
  const showColumn = (c: string) => {
    setParams(
      (p) => {
        p.set("column", c);
        return p;
      },
      { replace: true, preventScrollReset: true },
    );
    document.getElementById("capability")?.scrollIntoView({ behavior: "smooth", block: "start" });
  };
  const [dialog, setDialog] = useState<"as-built" | "delete" | null>(null);
  const remove = useDeleteDataset();
  const navigate = useNavigate();

  return (
    <>
      <Link to={`/projects/${project.id}`} className="mb-3 inline-flex items-center gap-1 text-xs font-semibold text-ink/55 hover:text-ink">
        <ChevronLeftIcon size={14} /> {project.name}
      </Link>
      <div className="mb-5 flex flex-wrap items-start justify-between gap-4">
        <div className="min-w-0">
          <p className="text-xs font-semibold text-ink/55">Data set</p>
          <h1 className="text-[22px] leading-7 font-extrabold tracking-[-0.015em] break-all text-ink">{dataset.name}</h1>
        </div>
        <div className="flex flex-wrap gap-2">
          <a
            href={`/api/datasets/${dataset.id}/file`}
            className="inline-flex h-8.5 items-center rounded-md border border-line bg-panel px-3.5 text-[13px] font-semibold text-ink hover:border-ink/30"
            download={dataset.name}
          >
            Download original
          </a>
          {canRun ? (
            <Button
              variant="primary"
              onClick={() => setDialog("as-built")}
              disabled={!dataset.columns.some((c) => c.mapping)}
              title={dataset.columns.some((c) => c.mapping) ? undefined : "Map a column first"}
            >
              Run as built
            </Button>
          ) : null}
          {canWrite ? (
            <Button variant="danger-ghost" icon={<TrashIcon />} onClick={() => setDialog("delete")}>
              Delete
            </Button>
          ) : null}
        </div>
      </div>

      <ArchivedProjectNotice project={project} toDo="map, delete or run this data set" className="mb-5" />
      <dl className="mb-5 grid grid-cols-2 gap-px overflow-hidden rounded-lg border border-line bg-line sm:grid-cols-5">
        <Fact label="Sent by">
          {dataset.uploadedByName ?? "a removed member"}
          {dataset.supplierName ? (
            <Badge tone="substrate" className="ml-1.5">
              {dataset.supplierName}
            </Badge>
          ) : null}
        </Fact>
        <Fact label="Received">
          <time dateTime={dataset.createdAt} className="tabular-nums">
            {formatDateTime(dataset.createdAt)}
          </time>
        </Fact>
        <Fact label="Rows">
          <span className="tabular-nums">{formatCount(dataset.rows)}</span>
        </Fact>
        <Fact label="File">
          {dataset.fileType.toUpperCase()}
          {dataset.sheet ? `, sheet “${dataset.sheet}”` : ""} · {formatBytes(dataset.sizeBytes)}
        </Fact>
        <Fact label="Report">{dataset.report ? reportNumber(dataset.report) : "—"}</Fact>
      </dl>

      <div className="flex flex-col gap-5">
        <Panel title="Columns and mapping" accent="var(--color-accel)" padded={false} meta={`${numeric.length} measured`}>
          <ColumnMapping dataset={dataset} canWrite={canWrite} onShow={showColumn} />
        </Panel>
        <div id="capability" className="scroll-mt-4">
          <Panel title="Capability" accent="var(--color-accel)" padded={false}>
            {column ? (
              <CapabilityView dataset={dataset} column={column} onColumn={showColumn} />
            ) : (
              <p className="p-4 text-[13px] text-ink/60">No measured column.</p>
            )}
          </Panel>
        </div>
        <Panel title="Preview" meta={`first ${dataset.preview.cells.length} rows`} padded={false}>
          <DatasetPreview dataset={dataset} />
        </Panel>
      </div>

      {dialog === "as-built" ? <AsBuiltDialog dataset={dataset} open onClose={() => setDialog(null)} /> : null}
      {dialog === "delete" ? (
        <ConfirmDialog
          open
          title={`Delete “${dataset.name}”?`}
          confirmLabel="Delete data set"
          pending={remove.isPending}
          error={remove.isError ? (isApiError(remove.error) ? remove.error.message : "It could not be deleted.") : null}
          onClose={() => setDialog(null)}
          onConfirm={() =>
            remove.mutate(
              { id: dataset.id, projectId: project.id, version: dataset.version },
              { onSuccess: () => navigate(`/projects/${project.id}`, { replace: true }) },
            )
          }
        >
          The measurements and their mappings go. Studies already run with them keep their frozen copy.
        </ConfirmDialog>
      ) : null}
    </>
  );
}

function Fact({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div className="bg-panel px-4 py-3">
      <dt className="text-[10px] font-bold tracking-[0.08em] text-ink/45 uppercase">{label}</dt>
      <dd className="mt-1 text-[13px] font-semibold break-words text-ink">{children}</dd>
    </div>
  );
}
