import { useState } from "react";
import { useQuery, type QueryClient } from "@tanstack/react-query";
import { data, useParams, type LoaderFunctionArgs } from "react-router";
import { IdSchema } from "@shared/schemas/common";
import type { SendResult } from "@shared/schemas/reports";
import { Alert } from "@frontend/components/ui/alert";
import { Panel } from "@frontend/components/ui/panel";
import { useMe } from "@frontend/features/auth/api/get-me";
import { ReportMeasurements } from "@frontend/features/datasets/components/report-measurements";
import { projectQueryOptions } from "@frontend/features/projects/api/get-project";
import { reportQueryOptions, useReport } from "@frontend/features/reports/api/get-report";
import { ReportAssumptions, ReportCautions } from "@frontend/features/reports/components/report-assumptions";
import { ReportComments } from "@frontend/features/reports/components/report-comments";
import { ReportDialogHost } from "@frontend/features/reports/components/report-dialog-host";
import { ReportHeader } from "@frontend/features/reports/components/report-header";
import { ReportKeyFacts } from "@frontend/features/reports/components/report-key-facts";
import { DraftNotice, SentNotice } from "@frontend/features/reports/components/report-notices";
import {
  ReportDownloadsPanel,
  ReportFilesPanel,
  ReportHistoryPanel,
  ReportRecordPanel,
} from "@frontend/features/reports/components/report-side-panels";
import { RequirementsTable, TolerancesTable } from "@frontend/features/reports/components/report-tables";
import { useReportActions } from "@frontend/features/reports/hooks/use-report-actions";
import { isApiError } from "@frontend/lib/api-client";
import { can } from "@frontend/lib/permissions";
import { requirePermission } from "../../route-guards";

const notFound = () => data({ message: "This report does not exist, or it is not released to you." }, { status: 404 });

export const reportLoader =
  (queryClient: QueryClient) =>
  async ({ request, params }: LoaderFunctionArgs) => {
    const id = IdSchema.safeParse(params.id);
    if (!id.success) throw notFound();
    try {
      await Promise.all([
        requirePermission(queryClient, request, "reports.read"),
        queryClient.ensureQueryData(reportQueryOptions(id.data)),
      ]);
    } catch (error) {
      if (isApiError(error) && error.status === 404) throw notFound();
      throw error;
    }
    return null;
  };

export function ReportRoute() {
  const { id = "" } = useParams();
  const { data: report } = useReport(id);
  const me = useMe();
  const asSupplier = can(me.role, "reports.inbox");
  // staff see whether the report's project is archived (read-only); a supplier never sees projects
  const project = useQuery({ ...projectQueryOptions(report.projectId), enabled: can(me.role, "projects.read") });
  const archived = !!project.data?.archivedAt;
  const { actions, dialog, close } = useReportActions(report, me.role, archived);
  const [sent, setSent] = useState<SendResult | null>(null);
  const c = report.content;
  const draft = report.status === "draft";

  return (
    <>
      <ReportHeader report={report} asSupplier={asSupplier} actions={actions} />
      {archived ? (
        <Alert tone="info" title={`The project “${project.data?.name}” is archived: this report is read-only`} className="mb-5">
          A released report can still be sent. Restore the project to change, release or revise it.
        </Alert>
      ) : null}
      {draft ? <DraftNotice asSupplier={asSupplier} /> : null}
      {sent ? <SentNotice sent={sent} /> : null}
      <ReportKeyFacts content={c} />

      <div className="grid gap-5 xl:grid-cols-[minmax(0,1fr)_340px]">
        <div className="min-w-0 space-y-5">
          <Panel title="Tolerances you hold" meta={`${c.tolerances.length}`} accent="var(--color-mag)" padded={false}>
            <TolerancesTable content={c} />
          </Panel>
          <Panel title="Requirements they feed" accent="var(--color-gyro)" padded={false}>
            <RequirementsTable content={c} />
          </Panel>
          <ReportAssumptions content={c} note={report.note} />
          <ReportCautions cautions={c.cautions} />
        </div>

        <div className="space-y-5">
          <ReportFilesPanel report={report} />
          <ReportRecordPanel report={report} asSupplier={asSupplier} />
          {!draft ? <ReportMeasurements reportId={report.id} canSend={can(me.role, "datasets.send")} /> : null}
          <Panel
            title={asSupplier ? "Questions and notes" : "Comments"}
            meta={report.comments.length ? `${report.comments.length}` : undefined}
          >
            <ReportComments reportId={report.id} comments={report.comments} asSupplier={asSupplier} released={!draft} />
          </Panel>
          <ReportHistoryPanel report={report} />
          {!asSupplier ? <ReportDownloadsPanel report={report} /> : null}
        </div>
      </div>

      <ReportDialogHost report={report} dialog={dialog} onClose={close} onSent={setSent} />
    </>
  );
}
