import { useState, type ReactNode } from "react";
import type { Report } from "@shared/schemas/reports";
import type { Role } from "@shared/schemas/common";
import { Button } from "@frontend/components/ui/button";
import { MailIcon, PencilIcon, PlusIcon, TrashIcon } from "@frontend/components/ui/icons";
import { can } from "@frontend/lib/permissions";

export type ReportDialogKind = "release" | "return" | "send" | "acknowledge" | "edit" | "discard" | "revise";

/**
 * The buttons a person may press on this report (by role and by the report's state), and which
 * of the report's dialogs is open. Buttons only open a dialog; the dialogs do the work.
 */
export function useReportActions(report: Report, role: Role, projectArchived = false) {
  const [dialog, setDialog] = useState<ReportDialogKind | null>(null);
  const draft = report.status === "draft";
  // an archived project is read-only (the server refuses the change): its reports may still be sent and acknowledged
  const changeable = !projectArchived;
  const open = (kind: ReportDialogKind) => () => setDialog(kind);
  const actions: ReactNode[] = [];
  if (changeable && draft && can(role, "reports.write")) {
    actions.push(
      <Button key="edit" icon={<PencilIcon />} onClick={open("edit")}>
        Change
      </Button>,
      <Button key="discard" variant="danger-ghost" icon={<TrashIcon />} onClick={open("discard")}>
        Discard
      </Button>,
    );
  }
  if (changeable && draft && can(role, "reports.release")) {
    actions.push(
      <Button key="return" onClick={open("return")}>
        Send back
      </Button>,
      <Button key="release" variant="primary" onClick={open("release")}>
        Release
      </Button>,
    );
  }
  if (changeable && !draft && can(role, "reports.write") && report.isLatest) {
    actions.push(
      <Button key="revise" icon={<PlusIcon />} onClick={open("revise")}>
        New revision
      </Button>,
    );
  }
  if (!draft && can(role, "reports.send")) {
    actions.push(
      <Button key="send" variant="primary" icon={<MailIcon />} onClick={open("send")}>
        Send to supplier
      </Button>,
    );
  }
  if (!draft && !report.acknowledgedAt && can(role, "reports.acknowledge")) {
    actions.push(
      <Button key="ack" variant="primary" onClick={open("acknowledge")}>
        Acknowledge
      </Button>,
    );
  }
  return { actions, dialog, close: () => setDialog(null) };
}
