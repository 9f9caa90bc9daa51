import { and, desc, eq } from "drizzle-orm";
import type { OutboxMessage } from "@shared/schemas/reports";
import type { Database } from "../db/client";
import { outboxMessages } from "../db/schema";
import { found, notFound } from "../lib/errors";
import { parseMail } from "../lib/mime";
import type { MailService } from "./mail";

const LIST_LIMIT = 200;

export async function listOutbox(db: Database, service: MailService | null, workspaceId: string) {
  const rows = await db
    .select({
      id: outboxMessages.id,
      mailFrom: outboxMessages.mailFrom,
      recipients: outboxMessages.recipients,
      subject: outboxMessages.subject,
      text: outboxMessages.text,
      attachments: outboxMessages.attachments,
      size: outboxMessages.size,
      receivedAt: outboxMessages.receivedAt,
    })
    .from(outboxMessages)
    .where(eq(outboxMessages.workspaceId, workspaceId))
    .orderBy(desc(outboxMessages.receivedAt))
    .limit(LIST_LIMIT);
  const messages: OutboxMessage[] = rows.map((r) => ({
    id: r.id,
    from: r.mailFrom,
    to: r.recipients,
    subject: r.subject,
    receivedAt: r.receivedAt.toISOString(),
    size: r.size,
    text: r.text,
    attachments: r.attachments.map((a, index) => ({ index, ...a })),
  }));
  return { mode: service?.mode ?? ("off" as const), address: service?.address ?? null, messages };
}

/** One attachment exactly as it arrived, decoded from the stored message. */
export async function outboxAttachment(db: Database, workspaceId: string, id: string, index: number) {
  const [row] = await db
    .select({ raw: outboxMessages.raw })
    .from(outboxMessages)
    .where(and(eq(outboxMessages.workspaceId, workspaceId), eq(outboxMessages.id, id)));
  const message = found(row, "The message");
  const attachment = (await parseMail(message.raw)).attachments[index];
  if (!attachment) throw notFound("The attachment");
  return attachment;
}
