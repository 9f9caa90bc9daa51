import { useNavigate } from "react-router";
import type { Report, SendResult } from "@shared/schemas/reports";
import { useSuppliers } from "@frontend/features/suppliers";
import type { ReportDialogKind } from "../hooks/use-report-actions";
import { BuildReportDialog } from "./build-report-dialog";
import { AcknowledgeDialog, DiscardDialog, EditDraftDialog, ReleaseDialog, ReturnDialog } from "./report-dialogs";
import { SendDialog } from "./send-report-dialog";

/** Shows the one report dialog that is open, if any. */
export function ReportDialogHost({
  report,
  dialog,
  onClose,
  onSent,
}: {
  report: Report;
  dialog: ReportDialogKind | null;
  onClose: () => void;
  onSent: (r: SendResult) => void;
}) {
  const navigate = useNavigate();
  switch (dialog) {
    case "release":
      return <ReleaseDialog report={report} onClose={onClose} />;
    case "return":
      return <ReturnDialog report={report} onClose={onClose} />;
    case "send":
      return <SendDialogWithContacts report={report} onClose={onClose} onSent={onSent} />;
    case "acknowledge":
      return <AcknowledgeDialog report={report} onClose={onClose} />;
    case "edit":
      return <EditDraftDialog report={report} onClose={onClose} />;
    case "discard":
      return (
        <DiscardDialog report={report} onClose={onClose} onDiscarded={() => navigate(`/projects/${report.projectId}`, { replace: true })} />
      );
    case "revise":
      return (
        <BuildReportDialog
          projectId={report.projectId}
          open
          onClose={onClose}
          onBuilt={(r) => {
            onClose();
            navigate(`/reports/${r.id}`);
          }}
          studyId={report.studyId ?? undefined}
          supplierId={report.supplierId ?? undefined}
          cpk={report.capability.cpk}
        />
      );
    default:
      return null;
  }
}

/** The send dialog with the supplier's contacts, read from the suppliers list staff may see. */
function SendDialogWithContacts({ report, onClose, onSent }: { report: Report; onClose: () => void; onSent: (r: SendResult) => void }) {
  const suppliers = useSuppliers();
  const contacts = suppliers.data ? (suppliers.data.find((s) => s.id === report.supplierId)?.contacts ?? []) : null;
  return <SendDialog report={report} contacts={contacts} onClose={onClose} onSent={onSent} />;
}
