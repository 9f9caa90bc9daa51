import { ROLE_IN_SENTENCE } from "@shared/permissions";
import type { Role } from "@shared/schemas/common";
import type { Actor } from "../middleware/session";
import type { MailService } from "./mail";

/**
 * Mails the invitation link to the invitee. The admin page keeps showing the link, so a
 * failure here is reported (false) but never undoes the invitation.
 */
export async function mailInvitation(
  mail: MailService | null,
  actor: Actor,
  invitation: { email: string; role: Role; expiresAt: Date },
  link: string,
): Promise<boolean> {
  if (!mail) return false;
  const until = new Intl.DateTimeFormat("en-GB", { year: "numeric", month: "long", day: "numeric", timeZone: "UTC" }).format(
    invitation.expiresAt,
  );
  const text = [
    "Hello,",
    "",
    `${actor.name} invites you to join ${actor.workspaceName} on Orthostack as ${ROLE_IN_SENTENCE[invitation.role]}.`,
    "",
    `Create your account here: ${link}`,
    "",
    `The link works once and until ${until}. If you did not expect this invitation, ignore this message.`,
  ].join("\n");
  const esc = (s: string) => s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");
  const html = `<div style="font-family:Manrope,Segoe UI,Helvetica,Arial,sans-serif;color:#17212b;font-size:14px;line-height:1.5;max-width:560px">
<p>Hello,</p>
<p>${esc(actor.name)} invites you to join <strong>${esc(actor.workspaceName)}</strong> on Orthostack as ${esc(ROLE_IN_SENTENCE[invitation.role])}.</p>
<p><a href="${esc(link)}" style="display:inline-block;background:#17212b;color:#f7f5f0;padding:8px 14px;border-radius:6px;text-decoration:none;font-weight:600">Create your account</a></p>
<p style="color:#5d6670;font-size:12px">The link works once and until ${esc(until)}. If you did not expect this invitation, ignore this message.</p>
</div>`;
  try {
    await mail.send({
      workspaceId: actor.workspaceId,
      to: invitation.email,
      subject: `${actor.workspaceName} invites you to Orthostack`,
      text,
      html,
    });
    return true;
  } catch {
    return false;
  }
}
