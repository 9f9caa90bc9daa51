/**
 * Outgoing mail through nodemailer. With SMTP settings in the environment it goes to that
 * server; otherwise (development, the demo, tests) a mail catcher on a loopback port takes
 * it and stores each message in `outbox_messages`, which the admin's outbox page shows.
 */
import type { AddressInfo } from "node:net";
import nodemailer, { type Transporter } from "nodemailer";
import { SMTPServer } from "smtp-server";
import type { Database } from "../db/client";
import { outboxMessages } from "../db/schema";
import type { Log } from "../deps";
import type { MailSettings } from "../lib/env";
import { HttpError } from "../lib/errors";
import { parseMail } from "../lib/mime";

/** Set on every message we send, so the outbox shows each workspace only its own mail. */
export const WORKSPACE_HEADER = "X-Orthostack-Workspace";
const MAX_MESSAGE_BYTES = 30 * 1024 * 1024;

export type OutgoingMail = {
  workspaceId: string;
  to: { name: string; email: string } | string;
  subject: string;
  text: string;
  html?: string;
  attachments?: Array<{ filename: string; content: Buffer; contentType: string }>;
};

export type MailService = {
  mode: "catcher" | "smtp";
  /** host:port of the catcher, or the SMTP server's host */
  address: string;
  send: (mail: OutgoingMail) => Promise<{ messageId: string }>;
  close: () => Promise<void>;
};

function describeTransport(s: Extract<MailSettings, { mode: "smtp" }>): string {
  if (typeof s.transport === "string") {
    try {
      const u = new URL(s.transport);
      return `${u.hostname}:${u.port || (u.protocol === "smtps:" ? 465 : 587)}`;
    } catch {
      return "SMTP server";
    }
  }
  return `${s.transport.host}:${s.transport.port}`;
}

async function storeCaught(db: Database, raw: Buffer, envelope: { from: string; to: string[] }) {
  const mail = await parseMail(raw);
  const ws = mail.headers.get(WORKSPACE_HEADER.toLowerCase())?.trim() ?? null;
  await db.insert(outboxMessages).values({
    workspaceId: ws && /^[0-9a-f-]{36}$/i.test(ws) ? ws : null,
    mailFrom: envelope.from,
    recipients: envelope.to,
    subject: mail.subject,
    text: mail.text.slice(0, 50_000),
    attachments: mail.attachments.map((a) => ({ fileName: a.fileName, contentType: a.contentType, size: a.content.length })),
    size: raw.length,
    raw,
  });
}

/** The catcher: accepts any message from this machine and stores it; nothing leaves. */
async function startCatcher(db: Database, port: number, log: Log) {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS", "AUTH"],
    banner: "Orthostack mail catcher",
    // loopback only: a reverse DNS lookup per connection would just add latency
    disableReverseLookup: true,
    size: MAX_MESSAGE_BYTES,
    logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (c: Buffer) => chunks.push(c));
      stream.on("end", () => {
        const envelope = {
          from: session.envelope.mailFrom ? session.envelope.mailFrom.address : "",
          to: session.envelope.rcptTo.map((r) => r.address),
        };
        storeCaught(db, Buffer.concat(chunks), envelope).then(
          () => callback(),
          (err) => {
            log("the mail catcher could not store a message", err);
            callback(new Error("could not store the message"));
          },
        );
      });
    },
  });
  server.on("error", (err) => log("mail catcher error", err));
  await new Promise<void>((resolve, reject) => {
    server.server.once("error", reject);
    server.listen(port, "127.0.0.1", () => resolve());
  });
  const address = server.server.address() as AddressInfo;
  return { server, port: address.port };
}

function makeSender(transport: Transporter, from: string): MailService["send"] {
  return async (mail) => {
    const info = await transport.sendMail({
      from,
      to: typeof mail.to === "string" ? mail.to : { name: mail.to.name, address: mail.to.email },
      subject: mail.subject,
      text: mail.text,
      html: mail.html,
      attachments: mail.attachments,
      headers: { [WORKSPACE_HEADER]: mail.workspaceId },
    });
    return { messageId: String(info.messageId ?? "") };
  };
}

export async function createMailService(db: Database, settings: MailSettings, log: Log): Promise<MailService> {
  if (settings.mode === "smtp") {
    const transport = nodemailer.createTransport(settings.transport);
    return {
      mode: "smtp",
      address: describeTransport(settings),
      send: makeSender(transport, settings.from),
      close: async () => transport.close(),
    };
  }
  const catcher = await startCatcher(db, settings.port, log);
  const transport = nodemailer.createTransport({ host: "127.0.0.1", port: catcher.port, secure: false, ignoreTLS: true });
  return {
    mode: "catcher",
    address: `127.0.0.1:${catcher.port}`,
    send: makeSender(transport, settings.from),
    close: async () => {
      transport.close();
      await new Promise<void>((resolve) => catcher.server.close(() => resolve()));
    },
  };
}

/** The mail service of the request's app, or a 503 saying nothing was sent. */
export function requireMail(mail: MailService | null): MailService {
  if (!mail) throw new HttpError(503, "mail_unavailable", "Mail is not running on this server; nothing was sent.");
  return mail;
}
