/**
 * What the local mail catcher received, read with mailparser: the headers, the plain-text body
 * and the attachments with their content.
 */
import { simpleParser } from "mailparser";

export type ParsedAttachment = { fileName: string; contentType: string; content: Buffer };
export type ParsedMail = {
  /** lower-case name → the first value sent under it, unfolded, as written (not decoded) */
  headers: Map<string, string>;
  subject: string;
  text: string;
  attachments: ParsedAttachment[];
};

export async function parseMail(raw: Buffer): Promise<ParsedMail> {
  const mail = await simpleParser(raw, {
    // we show the plain text only: no HTML made from it, nor text made from HTML
    skipTextToHtml: true,
    skipHtmlToText: true,
    skipImageLinks: true,
    skipTextLinks: true,
  });
  const headers = new Map<string, string>();
  for (const { key, line } of mail.headerLines) {
    // the first occurrence wins (Received: lines repeat; we read none of them)
    if (headers.has(key)) continue;
    const colon = line.indexOf(":");
    headers.set(
      key,
      line
        .slice(colon + 1)
        .replace(/\r?\n[ \t]+/g, " ")
        .trim(),
    );
  }
  return {
    headers,
    subject: mail.subject ?? "",
    text: mail.text ?? "",
    attachments: mail.attachments.map((a) => ({
      fileName: a.filename ?? "attachment",
      contentType: a.contentType || "application/octet-stream",
      content: a.content,
    })),
  };
}
