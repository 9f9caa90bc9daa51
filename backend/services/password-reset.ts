import { and, eq } from "drizzle-orm";
import type { Auth } from "../auth";
import type { Database } from "../db/client";
import type { AppDeps } from "../deps";
import { members, users } from "../db/schema";
import { issueResetToken, RESET_LINK_HOURS } from "../lib/accounts";
import { found } from "../lib/errors";
import type { Actor } from "../middleware/session";
import { recordActivity } from "./activity";

export const resetLink = (baseURL: string, token: string) => `${baseURL.replace(/\/$/, "")}/reset-password?token=${token}`;

/**
 * An admin sends a member a link to set a new password (they forgot it, or it may be known to
 * someone else). The link works once, for RESET_LINK_HOURS; using it ends all the member's
 * sessions (better-auth's revokeSessionsOnPasswordReset). Only the member receives the link.
 */
export async function sendResetLink(
  db: Database,
  auth: Auth,
  actor: Actor,
  memberId: string,
  { baseURL, mail, clock }: Pick<AppDeps, "baseURL" | "mail" | "clock">,
): Promise<{ mailed: boolean; expiresAt: string }> {
  const [row] = await db
    .select({ userId: users.id, email: users.email, name: users.name })
    .from(members)
    .innerJoin(users, eq(users.id, members.userId))
    .where(and(eq(members.workspaceId, actor.workspaceId), eq(members.id, memberId)));
  const member = found(row, "The member");
  const now = clock();
  const token = await issueResetToken(auth, member.userId, now);
  const expiresAt = new Date(now.getTime() + RESET_LINK_HOURS * 3_600_000);
  const link = resetLink(baseURL, token);
  let mailed = false;
  if (mail) {
    try {
      await mail.send({
        workspaceId: actor.workspaceId,
        to: member.email,
        subject: `Set a new Orthostack password for ${actor.workspaceName}`,
        text: [
          `Hello ${member.name},`,
          "",
          `${actor.name} sent you a link to set a new password for ${actor.workspaceName} on Orthostack:`,
          link,
          "",
          `The link works once, for ${RESET_LINK_HOURS} hours. Setting a password signs you out everywhere else.`,
          "If you did not expect this message, tell your admin.",
        ].join("\n"),
      });
      mailed = true;
    } catch {
      mailed = false;
    }
  }
  await recordActivity(db, {
    workspaceId: actor.workspaceId,
    actorId: actor.userId,
    action: "member.reset_link",
    summary: `sent ${member.name} a link to set a new password`,
  });
  return { mailed, expiresAt: expiresAt.toISOString() };
}
