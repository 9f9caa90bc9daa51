/** Sending a released report: one mail per supplier contact with the link and the stored PDF. */
import { and, asc, eq } from "drizzle-orm";
import { REPORT_CAUTIONS } from "@shared/reports/cautions";
import type { ReportContent, SendResult } from "@shared/schemas/reports";
import type { Database } from "../db/client";
import { reportFiles, reportSends, supplierContacts } from "../db/schema";
import { conflict, found, HttpError } from "../lib/errors";
import type { Actor } from "../middleware/session";
import { recordActivity } from "./activity";
import { requireMail, type MailService } from "./mail";
import { getReport, reportLabel, reportLink, visibleRow } from "./report-queries";
import { reportCode } from "@shared/reports/format";
import { formatIndex } from "@shared/format";

function mailBody(opts: {
  contact: string;
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
  const lines = [
    `Hello ${opts.contact},`,
    "",
    `${opts.workspace} has released tolerance report ${opts.code} revision ${opts.revision} for ${c.supplier.name}: the ${c.tolerances.length} tolerances your process holds on "${c.project.name}" (stack revision ${c.revision.number}), with the capability asked: ${cpk}.`,
    "",
    ...(opts.message ? [opts.message, ""] : []),
    `Open the report, acknowledge it or ask a question: ${opts.link}`,
    "",
    `The PDF is attached. Its SHA-256 checksum is ${opts.sha}; the same value is shown on the report's page.`,
    "",
    ...REPORT_CAUTIONS,
    "",
    `Sent by ${opts.sender} through Orthostack.`,
  ];
  const text = lines.join("\n");
  const esc = (s: string) => s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
  const html = `<div style="font-family:Manrope,Segoe UI,Helvetica,Arial,sans-serif;color:#17212b;font-size:14px;line-height:1.5;max-width:620px">
<p>Hello ${esc(opts.contact)},</p>
<p>${esc(opts.workspace)} has released tolerance report <strong>${esc(opts.code)} revision ${opts.revision}</strong> for ${esc(c.supplier.name)}: the ${c.tolerances.length} tolerances your process holds on “${esc(c.project.name)}” (stack revision ${c.revision.number}), with the capability asked: <strong>${esc(cpk)}</strong>.</p>
${opts.message ? `<p style="border-left:3px solid #d9d4c7;padding-left:10px">${esc(opts.message).replace(/\n/g, "<br>")}</p>` : ""}
<p><a href="${esc(opts.link)}" style="display:inline-block;background:#17212b;color:#f7f5f0;padding:8px 14px;border-radius:6px;text-decoration:none;font-weight:600">Open the report</a></p>
<p style="color:#5d6670;font-size:12px">The PDF is attached. SHA-256: <code>${opts.sha}</code></p>
<p style="color:#5d6670;font-size:12px;border-top:1px solid #d9d4c7;padding-top:10px">${REPORT_CAUTIONS.map(esc).join(" ")}</p>
<p style="color:#8a9099;font-size:12px">Sent by ${esc(opts.sender)} through Orthostack.</p>
</div>`;
  return { text, html };
}

/** Mails each contact of the supplier the link and the stored PDF; records who received it. */
export async function sendReport(
  db: Database,
  mailService: MailService | null,
  actor: Actor,
  id: string,
  message: string | undefined,
  baseURL: string,
): Promise<SendResult> {
  const row = await visibleRow(db, actor, id);
  if (row.status !== "released")
    throw conflict(
      `${reportCode(row.number)} revision ${row.revision} is a draft. A reviewer releases it before it is sent.`,
      "not_released",
    );
  if (!row.supplierId) throw conflict("The supplier company of this report was deleted; there is no one to send it to.", "no_contacts");
  const contacts = await db
    .select()
    .from(supplierContacts)
    .where(eq(supplierContacts.supplierId, row.supplierId))
    .orderBy(asc(supplierContacts.name));
  const c = row.content as unknown as ReportContent;
  if (contacts.length === 0)
    throw conflict(`${c.supplier.name} has no contacts to send to. An admin adds them on the Suppliers page.`, "no_contacts");
  const [pdf] = await db
    .select()
    .from(reportFiles)
    .where(and(eq(reportFiles.reportId, id), eq(reportFiles.kind, "pdf")));
  const file = found(pdf, "The report's PDF");
  const mail = requireMail(mailService);
  const link = reportLink(baseURL, id);
  const code = reportCode(row.number);
  const sent: Array<{ name: string; email: string }> = [];
  const failed: Array<{ name: string; email: string; error: string }> = [];
  for (const contact of contacts) {
    const body = mailBody({
      contact: contact.name,
      workspace: actor.workspaceName,
      sender: actor.name,
      code,
      revision: row.revision,
      c,
      link,
      sha: file.sha256,
      message,
    });
    try {
      await mail.send({
        workspaceId: actor.workspaceId,
        to: { name: contact.name, email: contact.email },
        subject: `${code} revision ${row.revision}: tolerances for ${c.project.name}`,
        text: body.text,
        html: body.html,
        attachments: [{ filename: file.fileName, content: file.data, contentType: file.contentType }],
      });
      sent.push({ name: contact.name, email: contact.email });
    } catch (e) {
      failed.push({
        name: contact.name,
        email: contact.email,
        error: e instanceof Error ? e.message.slice(0, 200) : "the mail server refused the message",
      });
    }
  }
  if (sent.length === 0)
    throw new HttpError(
      502,
      "mail_failed",
      `The mail server refused every message: ${failed[0]?.error ?? "unknown reason"}. Nothing was recorded as sent.`,
    );
  await db.transaction(async (tx) => {
    await tx.insert(reportSends).values({ reportId: id, sentBy: actor.userId, recipients: sent, message: message ?? "" });
    await recordActivity(tx, {
      workspaceId: actor.workspaceId,
      projectId: row.projectId,
      actorId: actor.userId,
      action: "report.sent",
      summary: `sent ${reportLabel(row)} to ${c.supplier.name} (${sent.map((s) => s.email).join(", ")})`,
      data: { reportId: id },
    });
  });
  return { report: await getReport(db, actor, id, baseURL), sent, failed };
}
