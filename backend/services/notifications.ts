/**
 * Who must act: a notification per person concerned, in the app and by e-mail through the same
 * mail path as the reports (unless that person turned the kind's e-mail off). The actor is never
 * told about their own act. A failed mail leaves the in-app notification in place.
 */
import { and, desc, eq, inArray, isNull, ne, sql } from "drizzle-orm";
import {
  NOTIFICATION_KIND_LABELS,
  NOTIFICATION_KINDS,
  type Notification,
  type NotificationKind,
  type NotificationList,
  type NotificationSettings,
} from "@shared/schemas/notifications";
import type { Database } from "../db/client";
import { members, notificationMailOptOuts, notifications, users } from "../db/schema";
import type { Actor } from "../middleware/session";
import type { MailService } from "./mail";

export type NotifyInput = {
  workspaceId: string;
  projectId: string | null;
  kind: NotificationKind;
  /** One line: "Revision 3 of “Ridgeline” waits for your review". */
  title: string;
  /** The app path that opens what it is about. */
  link: string;
  /** A sentence or two more for the mail. */
  detail?: string;
};

/** Everyone in the workspace with one of these roles, the actor left out. */
export async function membersWithRole(
  db: Database,
  workspaceId: string,
  roles: Array<"admin" | "engineer" | "reviewer">,
  except?: string,
): Promise<string[]> {
  const rows = await db
    .select({ userId: members.userId })
    .from(members)
    .where(and(eq(members.workspaceId, workspaceId), inArray(members.role, roles), except ? ne(members.userId, except) : undefined));
  return rows.map((r) => r.userId);
}

/**
 * Who is told that something waits for review or release: the reviewers; in a workspace with no
 * reviewer, its admins, who hold the same rights (so a small team is not left waiting unseen).
 */
export async function reviewersToTell(db: Database, workspaceId: string, except?: string): Promise<string[]> {
  const reviewers = await membersWithRole(db, workspaceId, ["reviewer"]);
  const people = reviewers.length > 0 ? reviewers : await membersWithRole(db, workspaceId, ["admin"]);
  return people.filter((id) => id !== except);
}

const esc = (s: string) => s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");

/** Stores one notification per recipient and mails those who did not opt out of the kind. */
export async function notify(
  { db, baseURL, mail }: { db: Database; baseURL: string; mail: MailService | null },
  recipients: Array<string | null | undefined>,
  actor: Pick<Actor, "userId" | "name">,
  n: NotifyInput,
): Promise<void> {
  const ids = [...new Set(recipients.filter((r): r is string => !!r && r !== actor.userId))];
  if (!ids.length) return;
  await db
    .insert(notifications)
    .values(
      ids.map((userId) => ({ workspaceId: n.workspaceId, userId, projectId: n.projectId, kind: n.kind, title: n.title, link: n.link })),
    );
  if (!mail) return;
  const optedOut = new Set(
    (
      await db
        .select({ userId: notificationMailOptOuts.userId })
        .from(notificationMailOptOuts)
        .where(and(inArray(notificationMailOptOuts.userId, ids), eq(notificationMailOptOuts.kind, n.kind)))
    ).map((r) => r.userId),
  );
  const people = await db.select({ id: users.id, name: users.name, email: users.email }).from(users).where(inArray(users.id, ids));
  const url = `${baseURL.replace(/\/$/, "")}${n.link}`;
  const footer = `You get this mail for “${NOTIFICATION_KIND_LABELS[n.kind]}”. Turn it off under Notifications in Orthostack.`;
  for (const p of people) {
    if (optedOut.has(p.id)) continue;
    const text = [
      `Hello ${p.name},`,
      "",
      n.title + ".",
      ...(n.detail ? ["", n.detail] : []),
      "",
      `Open it: ${url}`,
      "",
      `(${actor.name} did this.)`,
      "",
      footer,
    ].join("\n");
    const html = `<div style="font-family:Manrope,Segoe UI,Helvetica,Arial,sans-serif;color:#17212b;font-size:14px;line-height:1.5;max-width:560px">
<p>Hello ${esc(p.name)},</p>
<p><strong>${esc(n.title)}.</strong></p>
${n.detail ? `<p>${esc(n.detail).replace(/\n/g, "<br>")}</p>` : ""}
<p><a href="${esc(url)}" style="display:inline-block;background:#17212b;color:#f7f5f0;padding:8px 14px;border-radius:6px;text-decoration:none;font-weight:600">Open in Orthostack</a></p>
<p style="color:#8a9099;font-size:12px">${esc(actor.name)} did this. ${esc(footer)}</p>
</div>`;
    try {
      await mail.send({ workspaceId: n.workspaceId, to: { name: p.name, email: p.email }, subject: n.title, text, html });
    } catch {
      // the in-app notification is already stored; a mail server's refusal must not undo the act
    }
  }
}

export async function listNotifications(db: Database, actor: Actor): Promise<NotificationList> {
  const rows = await db
    .select()
    .from(notifications)
    .where(and(eq(notifications.userId, actor.userId), eq(notifications.workspaceId, actor.workspaceId)))
    .orderBy(desc(notifications.createdAt))
    .limit(100);
  const [{ unread }] = await db
    .select({ unread: sql<number>`count(*)::int` })
    .from(notifications)
    .where(and(eq(notifications.userId, actor.userId), eq(notifications.workspaceId, actor.workspaceId), isNull(notifications.readAt)));
  return {
    notifications: rows.map((r): Notification => ({
      id: r.id,
      kind: r.kind,
      title: r.title,
      link: r.link,
      projectId: r.projectId,
      createdAt: r.createdAt.toISOString(),
      readAt: r.readAt ? r.readAt.toISOString() : null,
    })),
    unread,
  };
}

/** Marks one's own notifications read (the given ones, or all). */
export async function markRead(db: Database, actor: Actor, ids?: string[]): Promise<NotificationList> {
  await db
    .update(notifications)
    .set({ readAt: new Date() })
    .where(
      and(
        eq(notifications.userId, actor.userId),
        isNull(notifications.readAt),
        ids ? inArray(notifications.id, ids.length ? ids : ["00000000-0000-0000-0000-000000000000"]) : undefined,
      ),
    );
  return listNotifications(db, actor);
}

export async function notificationSettings(db: Database, actor: Actor): Promise<NotificationSettings> {
  const off = new Set(
    (
      await db
        .select({ kind: notificationMailOptOuts.kind })
        .from(notificationMailOptOuts)
        .where(eq(notificationMailOptOuts.userId, actor.userId))
    ).map((r) => r.kind),
  );
  return { kinds: NOTIFICATION_KINDS.map((kind) => ({ kind, label: NOTIFICATION_KIND_LABELS[kind], email: !off.has(kind) })) };
}

export async function updateNotificationSettings(
  db: Database,
  actor: Actor,
  email: Partial<Record<NotificationKind, boolean>>,
): Promise<NotificationSettings> {
  await db.transaction(async (tx) => {
    for (const [kind, on] of Object.entries(email) as Array<[NotificationKind, boolean]>) {
      if (on)
        await tx
          .delete(notificationMailOptOuts)
          .where(and(eq(notificationMailOptOuts.userId, actor.userId), eq(notificationMailOptOuts.kind, kind)));
      else await tx.insert(notificationMailOptOuts).values({ userId: actor.userId, kind }).onConflictDoNothing();
    }
  });
  return notificationSettings(db, actor);
}
