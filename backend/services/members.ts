import { randomBytes } from "node:crypto";
import { and, asc, desc, eq, ne, sql } from "drizzle-orm";
import type * as z from "zod";
import type { CreateInvitationSchema, Invitation, Member, Role, UpdateMemberSchema } from "@shared/schemas/api";
import type { Auth } from "../auth";
import type { Database } from "../db/client";
import type { AppDeps, Clock } from "../deps";
import { invitations, members, supplierContacts, suppliers, users, workspaces } from "../db/schema";
import { badRequest, conflict, found, HttpError, isUniqueViolation } from "../lib/errors";
import type { Actor } from "../middleware/session";
import { createAccount, endSessions, renewAccount } from "../lib/accounts";
import { mailInvitation } from "./invitation-mail";

const INVITATION_DAYS = 7;

export async function listMembers(db: Database, workspaceId: string): Promise<Member[]> {
  const rows = await db
    .select({
      id: members.id,
      userId: members.userId,
      name: users.name,
      email: users.email,
      role: members.role,
      supplierId: members.supplierId,
      supplierName: suppliers.name,
      createdAt: members.createdAt,
    })
    .from(members)
    .innerJoin(users, eq(users.id, members.userId))
    .leftJoin(suppliers, eq(suppliers.id, members.supplierId))
    .where(eq(members.workspaceId, workspaceId))
    .orderBy(asc(users.name));
  return rows.map((r) => ({ ...r, createdAt: r.createdAt.toISOString() }));
}

async function getMember(db: Database, workspaceId: string, id: string) {
  const [m] = (await listMembers(db, workspaceId)).filter((x) => x.id === id);
  return found(m, "The member");
}

async function assertSupplierInWorkspace(db: Database, workspaceId: string, supplierId: string | null | undefined) {
  if (!supplierId) return;
  const [s] = await db
    .select({ id: suppliers.id })
    .from(suppliers)
    .where(and(eq(suppliers.workspaceId, workspaceId), eq(suppliers.id, supplierId)));
  if (!s) throw badRequest("The supplier company does not exist.", [{ path: "supplierId", message: "no such supplier in this workspace" }]);
}

async function adminCount(db: Database, workspaceId: string, exceptMemberId: string) {
  const [r] = await db
    .select({ n: sql<number>`count(*)::int` })
    .from(members)
    .where(and(eq(members.workspaceId, workspaceId), eq(members.role, "admin"), ne(members.id, exceptMemberId)));
  return r.n;
}

export async function updateMember(db: Database, actor: Actor, id: string, input: z.infer<typeof UpdateMemberSchema>) {
  const member = await getMember(db, actor.workspaceId, id);
  const supplierId = input.role === "supplier" ? (input.supplierId ?? member.supplierId) : null;
  if (input.role === "supplier" && !supplierId) {
    throw badRequest("A supplier user must belong to a supplier company.", [
      { path: "supplierId", message: "choose the supplier company" },
    ]);
  }
  await assertSupplierInWorkspace(db, actor.workspaceId, supplierId);
  if (member.role === "admin" && input.role !== "admin" && (await adminCount(db, actor.workspaceId, id)) === 0) {
    throw conflict("The workspace must keep at least one admin.", "last_admin");
  }
  await db.update(members).set({ role: input.role, supplierId }).where(eq(members.id, id));
  return getMember(db, actor.workspaceId, id);
}

/**
 * Removes a member and ends their sessions at once. The account itself stays (their name is on
 * revisions, comments and activity), with no workspace: it can sign in to nothing, and an admin
 * may invite the address again later.
 */
export async function removeMember(db: Database, auth: Auth, actor: Actor, id: string) {
  const member = await getMember(db, actor.workspaceId, id);
  if (member.userId === actor.userId) throw conflict("You cannot remove yourself.", "self_removal");
  if (member.role === "admin" && (await adminCount(db, actor.workspaceId, id)) === 0) {
    throw conflict("The workspace must keep at least one admin.", "last_admin");
  }
  await db.delete(members).where(eq(members.id, id));
  await endSessions(auth, member.userId);
}

/** The account of an address and whether it belongs to a workspace (an account without one was removed). */
async function accountOf(db: Database, email: string) {
  const [row] = await db
    .select({ id: users.id, memberId: members.id })
    .from(users)
    .leftJoin(members, eq(members.userId, users.id))
    .where(eq(users.email, email.toLowerCase()))
    .limit(1);
  return row ? { id: row.id, isMember: row.memberId !== null } : null;
}

// ---- invitations ------------------------------------------------------------------

export const invitationLink = (baseURL: string, token: string) => `${baseURL.replace(/\/$/, "")}/invite/${token}`;

/** What the invitation functions need of the app: the link's address, the mail, the time. */
export type InvitationDeps = Pick<AppDeps, "baseURL" | "mail" | "clock">;

function toInvitation(row: typeof invitations.$inferSelect, baseURL: string, now: Date): Invitation {
  const expired = row.status === "pending" && row.expiresAt.getTime() < now.getTime();
  return {
    id: row.id,
    email: row.email,
    role: row.role,
    supplierId: row.supplierId,
    status: row.status,
    link: row.status === "pending" && !expired ? invitationLink(baseURL, row.token) : null,
    createdAt: row.createdAt.toISOString(),
    expiresAt: row.expiresAt.toISOString(),
  };
}

export async function listInvitations(db: Database, workspaceId: string, { baseURL, clock }: InvitationDeps) {
  const rows = await db.select().from(invitations).where(eq(invitations.workspaceId, workspaceId)).orderBy(desc(invitations.createdAt));
  const now = clock();
  return rows.map((r) => toInvitation(r, baseURL, now));
}

export async function createInvitation(
  db: Database,
  actor: Actor,
  input: z.infer<typeof CreateInvitationSchema>,
  { baseURL, mail, clock }: InvitationDeps,
) {
  await assertSupplierInWorkspace(db, actor.workspaceId, input.supplierId);
  const existing = await accountOf(db, input.email);
  if (existing?.isMember) throw conflict(`${input.email} already has an account.`, "already_member");
  const token = randomBytes(24).toString("base64url");
  const [row] = await db.transaction(async (tx) => {
    // A newer invitation replaces any pending one for the same address.
    await tx
      .update(invitations)
      .set({ status: "revoked" })
      .where(and(eq(invitations.workspaceId, actor.workspaceId), eq(invitations.email, input.email), eq(invitations.status, "pending")));
    return tx
      .insert(invitations)
      .values({
        workspaceId: actor.workspaceId,
        email: input.email,
        role: input.role,
        supplierId: input.role === "supplier" ? (input.supplierId ?? null) : null,
        token,
        invitedBy: actor.userId,
        expiresAt: new Date(clock().getTime() + INVITATION_DAYS * 86_400_000),
      })
      .returning();
  });
  const mailed = await mailInvitation(mail, actor, row, invitationLink(baseURL, token));
  return { ...toInvitation(row, baseURL, clock()), mailed };
}

export async function revokeInvitation(db: Database, workspaceId: string, id: string) {
  const rows = await db
    .update(invitations)
    .set({ status: "revoked" })
    .where(and(eq(invitations.workspaceId, workspaceId), eq(invitations.id, id), eq(invitations.status, "pending")))
    .returning({ id: invitations.id });
  found(rows[0], "The pending invitation");
}

async function pendingByToken(db: Database, token: string, now: Date) {
  const [row] = await db
    .select({ invitation: invitations, workspaceName: workspaces.name })
    .from(invitations)
    .innerJoin(workspaces, eq(workspaces.id, invitations.workspaceId))
    .where(eq(invitations.token, token));
  if (!row || row.invitation.status !== "pending" || row.invitation.expiresAt.getTime() < now.getTime()) {
    throw new HttpError(404, "invitation_invalid", "This invitation is not valid any more. Ask your admin for a new one.");
  }
  return row;
}

export async function previewInvitation(db: Database, token: string, clock: Clock) {
  const { invitation, workspaceName } = await pendingByToken(db, token, clock());
  return { email: invitation.email, role: invitation.role as Role, workspaceName };
}

/**
 * Creates the invitee's account on the server (public sign-up is off in better-auth), makes it a
 * member and marks the invitation used in one transaction, then signs in through better-auth and
 * returns its response headers (the session cookie). A failure leaves no account behind.
 */
export async function acceptInvitation(db: Database, auth: Auth, clock: Clock, token: string, input: { name: string; password: string }) {
  const { invitation } = await pendingByToken(db, token, clock());
  const existing = await accountOf(db, invitation.email);
  if (existing?.isMember) throw conflict(`${invitation.email} already has an account.`, "already_member");
  // A removed member invited again keeps their account (and its history) with the new name and password.
  const user = existing
    ? (await renewAccount(auth, existing.id, input), { id: existing.id })
    : await createAccount(auth, { email: invitation.email, password: input.password, name: input.name }).catch((e) => {
        // Two accepts of one link at once: the other made the account a moment ago.
        if (isUniqueViolation(e)) throw conflict("This invitation is being accepted already.", "invitation_in_use");
        throw e;
      });
  try {
    await db.transaction(async (tx) => {
      // Only one accept may use the token: a second concurrent one finds it no longer pending.
      const used = await tx
        .update(invitations)
        .set({ status: "accepted", acceptedAt: clock() })
        .where(and(eq(invitations.id, invitation.id), eq(invitations.status, "pending")))
        .returning({ id: invitations.id });
      if (!used.length)
        throw new HttpError(404, "invitation_invalid", "This invitation is not valid any more. Ask your admin for a new one.");
      await tx.insert(members).values({
        workspaceId: invitation.workspaceId,
        userId: user.id,
        role: invitation.role,
        supplierId: invitation.supplierId,
      });
      // An invited supplier user is one of the company's contacts: reports are sent to them.
      if (invitation.supplierId) {
        const [known] = await tx
          .select({ id: supplierContacts.id })
          .from(supplierContacts)
          .where(
            and(
              eq(supplierContacts.supplierId, invitation.supplierId),
              sql`lower(${supplierContacts.email}) = ${invitation.email.toLowerCase()}`,
            ),
          );
        if (!known)
          await tx.insert(supplierContacts).values({ supplierId: invitation.supplierId, name: input.name, email: invitation.email });
      }
    });
  } catch (e) {
    if (!existing) await db.delete(users).where(eq(users.id, user.id));
    throw e;
  }
  const response = await auth.api.signInEmail({ body: { email: invitation.email, password: input.password }, asResponse: true });
  return response.headers;
}
