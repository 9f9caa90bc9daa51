/** Sending a released report: one mail per chosen supplier contact and per CC address, with the link and the chosen stored files. */
import { and, asc, eq, inArray } from "drizzle-orm";
import { REPORT_CAUTIONS } from "@shared/reports/cautions";
import { REPORT_FILE_KINDS, type ReportContent, type ReportFileKind, type SendResult } from "@shared/schemas/reports";
import type { Database } from "../db/client";
import { reportFiles, reportSends, supplierContacts } from "../db/schema";
import { badRequest, conflict, found, HttpError } from "../lib/errors";
import type { Actor } from "../middleware/session";
import { recordActivity } from "./activity";
import { requireMail, type MailService } from "./mail";
import { getReport, reportLabel, reportLink, visibleRow } from "./report-queries";
import { reportCode } from "@shared/reports/format";
import { formatIndex } from "@shared/format";

const FILE_WORDS: Record<ReportFileKind, string> = { pdf: "the PDF", xlsx: "the spreadsheet", csv: "the CSV" };

function attachedSentence(kinds: ReportFileKind[]): string {
  if (kinds.length === 0) return "Nothing is attached: open the report from the link.";
  const words = kinds.map((k) => FILE_WORDS[k]);
  const list = words.length === 1 ? words[0] : `${words.slice(0, -1).join(", ")} and ${words[words.length - 1]}`;
  return `${list[0].toUpperCase()}${list.slice(1)} ${kinds.length === 1 ? "is" : "are"} attached.`;
}

function mailBody(opts: {
  contact: string;
  /** set on a CC copy: the contacts the report went to */
  copyOf?: string;
  attached: ReportFileKind[];
  workspace: string;
  sender: string;
  code: string;
  revision: number;
  c: ReportContent;
  link: string;
  sha: string;
  message?: string;
}) {
  const { c } = opts;
  const cpk = `Cpk ≥ ${formatIndex(c.capability.cpk)}${Object.keys(c.capability.overrides).length || c.tolerances.some((t) => t.raised) ? " (some tolerances ask more; see the table)" : ""}`;
  const greeting =
    opts.copyOf !== undefined ? `A copy of the message sent to ${opts.copyOf} at ${c.supplier.name}.` : `Hello ${opts.contact},`;
  const files = attachedSentence(opts.attached);
  const lines = [
    greeting,
    "",
    `${opts.workspace} has released tolerance report ${opts.code} revision ${opts.revision} for ${c.supplier.name}: the ${c.tolerances.length} tolerances your process holds on "${c.project.name}" (stack revision ${c.revision.number}), with the capability asked: ${cpk}.`,
    "",
    ...(opts.message ? [opts.message, ""] : []),
    `Open the report, acknowledge it or ask a question: ${opts.link}`,
    "",
    `${files} The PDF's SHA-256 checksum is ${opts.sha}; the same value is shown on the report's page.`,
    "",
    ...REPORT_CAUTIONS,
    "",
    `Sent by ${opts.sender} through Orthostack.`,
  ];
  const text = lines.join("\n");
  const esc = (s: string) => s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
  const html = `<div style="font-family:Manrope,Segoe UI,Helvetica,Arial,sans-serif;color:#17212b;font-size:14px;line-height:1.5;max-width:620px">
<p>${esc(greeting)}</p>
<p>${esc(opts.workspace)} has released tolerance report <strong>${esc(opts.code)} revision ${opts.revision}</strong> for ${esc(c.supplier.name)}: the ${c.tolerances.length} tolerances your process holds on “${esc(c.project.name)}” (stack revision ${c.revision.number}), with the capability asked: <strong>${esc(cpk)}</strong>.</p>
${opts.message ? `<p style="border-left:3px solid #d9d4c7;padding-left:10px">${esc(opts.message).replace(/\n/g, "<br>")}</p>` : ""}
<p><a href="${esc(opts.link)}" style="display:inline-block;background:#17212b;color:#f7f5f0;padding:8px 14px;border-radius:6px;text-decoration:none;font-weight:600">Open the report</a></p>
<p style="color:#5d6670;font-size:12px">${esc(files)} The PDF's SHA-256: <code>${opts.sha}</code></p>
<p style="color:#5d6670;font-size:12px;border-top:1px solid #d9d4c7;padding-top:10px">${REPORT_CAUTIONS.map(esc).join(" ")}</p>
<p style="color:#8a9099;font-size:12px">Sent by ${esc(opts.sender)} through Orthostack.</p>
</div>`;
  return { text, html };
}

/** What the engineer chose in the send dialog (validated by SendReportSchema). */
export type SendChoice = { message?: string; contactIds?: string[]; cc: string[]; attachments: ReportFileKind[] };

/**
 * Mails the chosen contacts of the supplier (all of them by default) the link and the chosen
 * released files, and a copy to each CC address; records who received what.
 */
export async function sendReport(
  db: Database,
  mailService: MailService | null,
  actor: Actor,
  id: string,
  choice: SendChoice,
  baseURL: string,
): Promise<SendResult> {
  const { message } = choice;
  const row = await visibleRow(db, actor, id);
  if (row.status !== "released")
    throw conflict(
      `${reportCode(row.number)} revision ${row.revision} is a draft. A reviewer releases it before it is sent.`,
      "not_released",
    );
  if (!row.supplierId) throw conflict("The supplier company of this report was deleted; there is no one to send it to.", "no_contacts");
  const all = await db
    .select()
    .from(supplierContacts)
    .where(eq(supplierContacts.supplierId, row.supplierId))
    .orderBy(asc(supplierContacts.name));
  const c = row.content;
  if (all.length === 0)
    throw conflict(`${c.supplier.name} has no contacts to send to. An admin adds them on the Suppliers page.`, "no_contacts");
  const unknown = (choice.contactIds ?? []).flatMap((cid, i) =>
    all.some((x) => x.id === cid) ? [] : [{ path: `contactIds[${i}]`, message: `not a contact of ${c.supplier.name}` }],
  );
  if (unknown.length) throw badRequest(`Choose among ${c.supplier.name}'s contacts.`, unknown);
  const contacts = choice.contactIds ? all.filter((x) => choice.contactIds!.includes(x.id)) : all;
  // an address already among the contacts is not copied in twice
  const cc = [...new Set(choice.cc)].filter((e) => !contacts.some((x) => x.email.toLowerCase() === e));
  const files = await db
    .select()
    .from(reportFiles)
    .where(and(eq(reportFiles.reportId, id), inArray(reportFiles.kind, choice.attachments.length ? choice.attachments : ["pdf"])));
  const pdf = found(
    (
      await db
        .select()
        .from(reportFiles)
        .where(and(eq(reportFiles.reportId, id), eq(reportFiles.kind, "pdf")))
    )[0],
    "The report's PDF",
  );
  const attached = REPORT_FILE_KINDS.filter((k) => choice.attachments.includes(k)).map((k) =>
    found(
      files.find((f) => f.kind === k),
      `The report's ${k} file`,
    ),
  );
  const mail = requireMail(mailService);
  const link = reportLink(baseURL, id);
  const code = reportCode(row.number);
  const sent: Array<{ name: string; email: string; cc?: boolean }> = [];
  const failed: Array<{ name: string; email: string; error: string }> = [];
  const recipients = [
    ...contacts.map((x) => ({ name: x.name, email: x.email, cc: false })),
    ...cc.map((e) => ({ name: e, email: e, cc: true })),
  ];
  for (const to of recipients) {
    const body = mailBody({
      contact: to.cc ? "" : to.name,
      copyOf: to.cc ? contacts.map((x) => x.name).join(", ") : undefined,
      workspace: actor.workspaceName,
      sender: actor.name,
      code,
      revision: row.revision,
      c,
      link,
      sha: pdf.sha256,
      attached: attached.map((f) => f.kind as ReportFileKind),
      message,
    });
    try {
      await mail.send({
        workspaceId: actor.workspaceId,
        to: to.cc ? to.email : { name: to.name, email: to.email },
        subject: `${to.cc ? "Copy: " : ""}${code} revision ${row.revision}: tolerances for ${c.project.name}`,
        text: body.text,
        html: body.html,
        attachments: attached.map((f) => ({ filename: f.fileName, content: f.data, contentType: f.contentType })),
      });
      sent.push(to.cc ? { name: to.name, email: to.email, cc: true } : { name: to.name, email: to.email });
    } catch (e) {
      failed.push({
        name: to.name,
        email: to.email,
        error: e instanceof Error ? e.message.slice(0, 200) : "the mail server refused the message",
      });
    }
  }
  if (!sent.some((x) => !x.cc))
    throw new HttpError(
      502,
      "mail_failed",
      `The mail server refused every message to ${c.supplier.name}: ${failed[0]?.error ?? "unknown reason"}. Nothing was recorded as sent.`,
    );
  await db.transaction(async (tx) => {
    await tx.insert(reportSends).values({
      reportId: id,
      sentBy: actor.userId,
      recipients: sent,
      message: message ?? "",
      attachments: attached.map((f) => f.kind as ReportFileKind),
    });
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      projectId: row.projectId,
      actorId: actor.userId,
      action: "report.sent",
      summary: `sent ${reportLabel(row)} to ${c.supplier.name} (${sent.map((s) => (s.cc ? `cc ${s.email}` : s.email)).join(", ")})`,
      data: { reportId: id, attachments: attached.map((f) => f.kind) },
    });
  });
  return { report: await getReport(db, actor, id, baseURL), sent, failed };
}
