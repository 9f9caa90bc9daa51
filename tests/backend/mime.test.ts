import { describe, expect, it } from "vitest";
import MailComposer from "nodemailer/lib/mail-composer";
import { parseMail } from "@backend/lib/mime";

const compose = (mail: ConstructorParameters<typeof MailComposer>[0]) =>
  new Promise<Buffer>((resolve, reject) => new MailComposer(mail).compile().build((err, msg) => (err ? reject(err) : resolve(msg))));

describe("parseMail (what the catcher stored)", () => {
  it("reads the headers, the encoded subject, the plain text and each attachment with its bytes", async () => {
    const pdf = Buffer.from([0x25, 0x50, 0x44, 0x46, 0x00, 0xff, 0x10]);
    const raw = await compose({
      from: "Orthostack <noreply@orthostack.test>",
      to: "Jun Park <jun@supplier.test>",
      subject: "Bericht R-0007 — Gehäuse µm-Toleranzen",
      text: "Dear Jun,\n\nthe report is attached.\n",
      html: "<p>Dear Jun,</p>",
      headers: { "X-Orthostack-Workspace": "7f1c0c57-4a3e-4a8e-9e55-0d2b5c1b8a11" },
      attachments: [
        { filename: "Bericht R-0007 Gehäuse.pdf", content: pdf, contentType: "application/pdf" },
        { filename: "measurements.csv", content: "a;b\n1,5;2\n", contentType: "text/csv" },
      ],
    });
    const mail = await parseMail(raw);
    expect(mail.headers.get("x-orthostack-workspace")).toBe("7f1c0c57-4a3e-4a8e-9e55-0d2b5c1b8a11");
    expect(mail.subject).toBe("Bericht R-0007 — Gehäuse µm-Toleranzen");
    expect(mail.text.trim()).toBe("Dear Jun,\n\nthe report is attached.");
    expect(mail.attachments.map((a) => [a.fileName, a.contentType])).toEqual([
      ["Bericht R-0007 Gehäuse.pdf", "application/pdf"],
      ["measurements.csv", "text/csv"],
    ]);
    expect(mail.attachments[0].content.equals(pdf)).toBe(true);
    expect(mail.attachments[1].content.toString("utf8")).toBe("a;b\n1,5;2\n");
  });

  it("keeps the first of repeated headers and unfolds long ones", async () => {
    const raw = Buffer.from(
      "Received: from a\r\nReceived: from b\r\nX-Long: one\r\n two\r\nSubject: plain\r\nContent-Type: text/plain\r\n\r\nbody\r\n",
      "latin1",
    );
    const mail = await parseMail(raw);
    expect(mail.headers.get("received")).toBe("from a");
    expect(mail.headers.get("x-long")).toBe("one two");
    expect(mail.subject).toBe("plain");
    expect(mail.text.trim()).toBe("body");
    expect(mail.attachments).toEqual([]);
  });
});
