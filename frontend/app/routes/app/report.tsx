import { useState, type ReactNode } from "react";
import type { QueryClient } from "@tanstack/react-query";
import { data, Link, useNavigate, useParams, type LoaderFunctionArgs } from "react-router";
import { IdSchema } from "@shared/schemas/common";
import type { Report, SendResult } from "@shared/schemas/reports";
import { Alert } from "@frontend/components/ui/alert";
import { Button } from "@frontend/components/ui/button";
import { CopyButton } from "@frontend/components/ui/copy-button";
import { CheckIcon, ChevronLeftIcon, MailIcon, PencilIcon, PlusIcon, TrashIcon } from "@frontend/components/ui/icons";
import { Panel } from "@frontend/components/ui/panel";
import { ReportMeasurements } from "@frontend/features/datasets/components/report-measurements";
import { useMe } from "@frontend/features/auth/api/get-me";
import { reportQueryOptions, useReport } from "@frontend/features/reports/api/get-report";
import { BuildReportDialog } from "@frontend/features/reports/components/build-report-dialog";
import { DownloadButtons } from "@frontend/features/reports/components/download-buttons";
import { AcknowledgeDialog, DiscardDialog, EditDraftDialog, ReleaseDialog, SendDialog } from "@frontend/features/reports/components/report-dialogs";
import { ReportComments } from "@frontend/features/reports/components/report-comments";
import { ReportStatus, reportTitle } from "@frontend/features/reports/components/report-status";
import { RequirementsTable, TolerancesTable } from "@frontend/features/reports/components/report-tables";
import { FILE_LABEL, formatBytes } from "@frontend/features/reports/lib/files";
import { useSuppliers } from "@frontend/features/suppliers/api/get-suppliers";
import { isApiError } from "@frontend/lib/api-client";
import { cn } from "@frontend/lib/cn";
import { formatDateTime } from "@frontend/lib/format";
import { can } from "@frontend/lib/permissions";
import { requirePermission } from "../../route-guards";

const notFound = () => data({ message: "This report does not exist, or it is not released to you." }, { status: 404 });

export const reportLoader =
  (queryClient: QueryClient) =>
  async ({ request, params }: LoaderFunctionArgs) => {
    const id = IdSchema.safeParse(params.id);
    if (!id.success) throw notFound();
    try {
      await Promise.all([requirePermission(queryClient, request, "reports.read"), queryClient.ensureQueryData(reportQueryOptions(id.data))]);
    } catch (error) {
      if (isApiError(error) && error.status === 404) throw notFound();
      throw error;
    }
    return null;
  };

type DialogKind = "release" | "send" | "acknowledge" | "edit" | "discard" | "revise" | null;

export function ReportRoute() {
  const { id = "" } = useParams();
  const { data: report } = useReport(id);
  const me = useMe();
  const navigate = useNavigate();
  const asSupplier = me.role === "supplier";
  const [dialog, setDialog] = useState<DialogKind>(null);
  const [sent, setSent] = useState<SendResult | null>(null);
  const c = report.content;
  const draft = report.status === "draft";
  const fed = c.requirements.filter((r) => r.fed).length;
  const passing = c.requirements.filter((r) => r.passes).length;

  const actions: ReactNode[] = [];
  if (draft && can(me.role, "reports.write")) {
    actions.push(
      <Button key="edit" icon={<PencilIcon />} onClick={() => setDialog("edit")}>
        Change
      </Button>,
      <Button key="discard" variant="danger-ghost" icon={<TrashIcon />} onClick={() => setDialog("discard")}>
        Discard
      </Button>,
    );
  }
  if (draft && can(me.role, "reports.release")) {
    actions.push(
      <Button key="release" variant="primary" onClick={() => setDialog("release")}>
        Release
      </Button>,
    );
  }
  if (!draft && can(me.role, "reports.write") && report.isLatest) {
    actions.push(
      <Button key="revise" icon={<PlusIcon />} onClick={() => setDialog("revise")}>
        New revision
      </Button>,
    );
  }
  if (!draft && can(me.role, "reports.send")) {
    actions.push(
      <Button key="send" variant="primary" icon={<MailIcon />} onClick={() => setDialog("send")}>
        Send to supplier
      </Button>,
    );
  }
  if (!draft && !report.acknowledgedAt && can(me.role, "reports.acknowledge")) {
    actions.push(
      <Button key="ack" variant="primary" onClick={() => setDialog("acknowledge")}>
        Acknowledge
      </Button>,
    );
  }

  return (
    <>
      <Link
        to={asSupplier ? "/reports" : `/projects/${report.projectId}`}
        className="mb-3 inline-flex items-center gap-1 text-xs font-semibold text-ink/55 hover:text-ink"
      >
        <ChevronLeftIcon size={14} /> {asSupplier ? "Reports" : report.projectName}
      </Link>

      <div className="mb-4 flex flex-wrap items-start justify-between gap-4">
        <div className="min-w-0">
          <p className="text-xs font-bold tracking-[0.06em] text-mag uppercase">Supplier tolerance report</p>
          <div className="mt-0.5 flex flex-wrap items-center gap-2.5">
            <h1 className="text-[22px] leading-7 font-extrabold tracking-[-0.015em] text-ink">{reportTitle(report)}</h1>
            <ReportStatus report={report} />
          </div>
          <p className="mt-1 text-[13px] text-ink/65">
            <span className="font-semibold text-ink">{report.supplierName}</span> · {report.projectName} · from study {c.study.number}
            {c.study.label ? ` (${c.study.label})` : ""} on stack revision {c.revision.number}
          </p>
        </div>
        <div className="flex flex-wrap items-center gap-2">{actions}</div>
      </div>

      {draft ? (
        <Alert tone="info" className="mb-4" title="Draft: not released">
          {asSupplier
            ? "This revision is not released."
            : "The supplier cannot see a draft. Downloads are marked DRAFT and made fresh each time; a reviewer's release makes the files final."}
        </Alert>
      ) : null}
      {sent ? (
        <div role="status" className="mb-4 flex gap-2.5 rounded-md border border-pass/25 bg-pass/[0.06] px-3 py-2.5 text-[13px]">
          <CheckIcon className="mt-0.5 shrink-0 text-pass" />
          <div>
            <p className="font-semibold text-ink">
              Sent to {sent.sent.length} contact{sent.sent.length === 1 ? "" : "s"} with the PDF attached
            </p>
            <p className="text-ink/70">{sent.sent.map((s) => s.email).join(", ")}</p>
            {sent.failed.length ? <p className="text-fail">Not delivered: {sent.failed.map((f) => `${f.email} (${f.error})`).join(", ")}</p> : null}
          </div>
        </div>
      ) : null}

      <dl className="mb-5 grid grid-cols-2 gap-px overflow-hidden rounded-lg border border-line bg-line sm:grid-cols-4">
        <Fact label="Tolerances you hold">{c.tolerances.length}</Fact>
        <Fact label="Capability asked">Cpk ≥ {c.capability.cpk.toFixed(2)}</Fact>
        <Fact label="Requirements fed">
          {fed} of {c.requirements.length}
        </Fact>
        <Fact label="Predicted to pass" tone={passing === c.requirements.length ? "pass" : "fail"}>
          {passing} of {c.requirements.length}
        </Fact>
      </dl>

      <div className="grid gap-5 xl:grid-cols-[minmax(0,1fr)_340px]">
        <div className="min-w-0 space-y-5">
          <Panel title="Tolerances you hold" meta={`${c.tolerances.length}`} accent="var(--color-mag)" padded={false}>
            <TolerancesTable content={c} />
          </Panel>
          <Panel title="Requirements they feed" accent="var(--color-gyro)" padded={false}>
            <RequirementsTable content={c} />
          </Panel>
          <Panel title="Assumptions of the study" accent="var(--color-asic)">
            <dl className="grid gap-x-6 gap-y-2 text-[13px] sm:grid-cols-2">
              <Item label="Field inclination">
                {c.study.inclinationDeg.toFixed(2)}°{c.study.site ? ` (${c.study.site.model}, ${c.study.site.latitudeDeg}°, ${c.study.site.longitudeDeg}°, ${c.study.site.date})` : ", as entered"}
              </Item>
              <Item label="Calibration">{c.study.calibration.after === "none" ? "none" : `after ${c.study.calibration.after}, residual ${c.study.calibration.residual ?? "none"}`}</Item>
              <Item label="Trials and seed">
                {c.study.trials.toLocaleString("en-US")} trials, seed {c.study.seed}
              </Item>
              <Item label="Heading sweep">
                every {c.study.headingStepDeg}° at {c.study.tilts.length} tilt{c.study.tilts.length === 1 ? "" : "s"}
              </Item>
              {report.note ? <Item label="Note from the engineer">{report.note}</Item> : null}
            </dl>
          </Panel>
          <div className="rounded-lg border border-fail/25 bg-fail/[0.04] px-4 py-3 text-[13px] text-ink/80" role="note" aria-label="Cautions">
            <p className="mb-1 text-2xs font-extrabold tracking-[0.08em] text-fail uppercase">Read before use</p>
            {c.cautions.map((t) => (
              <p key={t}>{t}</p>
            ))}
          </div>
        </div>

        <div className="space-y-5">
          <Panel title="Files" meta={draft ? "made on download" : "stored at release"}>
            <DownloadButtons reportId={report.id} compact />
            {report.files.length ? (
              <ul className="mt-3 space-y-2" aria-label="Stored files">
                {report.files.map((f) => (
                  <li key={f.kind} className="text-xs">
                    <p className="flex justify-between gap-2">
                      <span className="font-semibold text-ink">{FILE_LABEL[f.kind]}</span>
                      <span className="text-ink/50 tabular-nums">{formatBytes(f.size)}</span>
                    </p>
                    <p className="font-mono text-[10.5px] break-all text-ink/60" title="SHA-256 checksum of the file as stored and sent">
                      SHA-256 {f.sha256}
                    </p>
                  </li>
                ))}
              </ul>
            ) : null}
          </Panel>

          <Panel title="Record">
            <ol className="space-y-2.5 text-[13px]">
              <Step done label="Built" who={report.createdByName} at={report.createdAt} />
              <Step done={!draft} label="Released" who={report.releasedByName} at={report.releasedAt} />
              {asSupplier ? null : <Step done={report.sends.length > 0} label="Sent" who={report.sends[0]?.sentByName ?? null} at={report.sends[0]?.sentAt ?? null} extra={report.sends[0] ? report.sends[0].recipients.map((r) => r.email).join(", ") : undefined} />}
              <Step done={!!report.acknowledgedAt} label="Acknowledged" who={report.acknowledgedByName} at={report.acknowledgedAt} />
            </ol>
            {!asSupplier ? (
              <div className="mt-3 flex items-center justify-between gap-2 border-t border-line pt-3">
                <span className="min-w-0 truncate text-xs text-ink/55" title={report.link}>
                  Supplier link: {report.link}
                </span>
                <CopyButton value={report.link} />
              </div>
            ) : null}
          </Panel>

          {!draft ? <ReportMeasurements reportId={report.id} canSend={asSupplier || can(me.role, "projects.write")} /> : null}

          <Panel title={asSupplier ? "Questions and notes" : "Comments"} meta={report.comments.length ? `${report.comments.length}` : undefined}>
            <ReportComments reportId={report.id} comments={report.comments} asSupplier={asSupplier} released={!draft} />
          </Panel>

          {report.history.length > 1 ? (
            <Panel title="Revisions of this report" padded={false}>
              <ul className="divide-y divide-line/70 text-[13px]">
                {report.history.map((h) => (
                  <li key={h.id} className={cn("flex items-center justify-between px-4 py-2", h.id === report.id && "bg-paper/70")}>
                    <Link to={`/reports/${h.id}`} className="font-semibold text-ink hover:underline">
                      Revision {h.revision}
                    </Link>
                    <span className="text-xs text-ink/55">{h.status === "released" ? `released ${formatDateTime(h.releasedAt!)}` : "draft"}</span>
                  </li>
                ))}
              </ul>
            </Panel>
          ) : null}

          {!asSupplier && report.downloads.length ? (
            <Panel title="Downloads" meta={`${report.downloads.length}`} padded={false}>
              <ul className="max-h-56 divide-y divide-line/70 overflow-y-auto text-xs">
                {report.downloads.map((d, i) => (
                  <li key={i} className="flex justify-between gap-2 px-4 py-1.5">
                    <span>
                      <span className={cn("font-semibold", d.role === "supplier" ? "text-mag" : "text-ink")}>{d.userName ?? "—"}</span> · {d.kind.toUpperCase()}
                    </span>
                    <span className="text-ink/50 tabular-nums">{formatDateTime(d.at)}</span>
                  </li>
                ))}
              </ul>
            </Panel>
          ) : null}
        </div>
      </div>

      {dialog === "release" ? <ReleaseDialog report={report} onClose={() => setDialog(null)} /> : null}
      {dialog === "send" ? <SendDialogWithContacts report={report} onClose={() => setDialog(null)} onSent={setSent} /> : null}
      {dialog === "acknowledge" ? <AcknowledgeDialog report={report} onClose={() => setDialog(null)} /> : null}
      {dialog === "edit" ? <EditDraftDialog report={report} onClose={() => setDialog(null)} /> : null}
      {dialog === "discard" ? <DiscardDialog report={report} onClose={() => setDialog(null)} onDiscarded={() => navigate(`/projects/${report.projectId}`, { replace: true })} /> : null}
      {dialog === "revise" ? (
        <BuildReportDialog
          projectId={report.projectId}
          open
          onClose={() => setDialog(null)}
          onBuilt={(r) => {
            setDialog(null);
            navigate(`/reports/${r.id}`);
          }}
          studyId={report.studyId ?? undefined}
          supplierId={report.supplierId ?? undefined}
          cpk={report.capability.cpk}
        />
      ) : null}
    </>
  );
}

/** The send dialog with the supplier's contacts, read from the suppliers list staff may see. */
function SendDialogWithContacts({ report, onClose, onSent }: { report: Report; onClose: () => void; onSent: (r: SendResult) => void }) {
  const suppliers = useSuppliers();
  const contacts = suppliers.data ? (suppliers.data.find((s) => s.id === report.supplierId)?.contacts ?? []) : null;
  return <SendDialog report={report} contacts={contacts} onClose={onClose} onSent={onSent} />;
}

function Fact({ label, children, tone }: { label: string; children: ReactNode; tone?: "pass" | "fail" }) {
  return (
    <div className="bg-panel px-4 py-3">
      <dt className="text-[10px] font-bold tracking-[0.08em] text-ink/45 uppercase">{label}</dt>
      <dd className={cn("mt-1 text-[15px] font-extrabold tabular-nums", tone === "pass" ? "text-pass" : tone === "fail" ? "text-fail" : "text-ink")}>{children}</dd>
    </div>
  );
}

function Item({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div>
      <dt className="text-xs font-semibold text-ink/50">{label}</dt>
      <dd className="text-ink/85">{children}</dd>
    </div>
  );
}

function Step({ done, label, who, at, extra }: { done: boolean; label: string; who: string | null; at: string | null; extra?: string }) {
  return (
    <li className="flex gap-2.5">
      <span className={cn("mt-1 size-2.5 shrink-0 rounded-full border-2", done ? "border-pass bg-pass" : "border-line bg-panel")} aria-hidden="true" />
      <div className="min-w-0">
        <p className={cn("font-semibold", done ? "text-ink" : "text-ink/45")}>
          {label}
          {done && who ? <span className="font-normal text-ink/70"> by {who}</span> : null}
        </p>
        {done && at ? <p className="text-xs text-ink/50 tabular-nums">{formatDateTime(at)}</p> : <p className="text-xs text-ink/40">not yet</p>}
        {done && extra ? <p className="truncate text-xs text-ink/50" title={extra}>{extra}</p> : null}
      </div>
    </li>
  );
}
