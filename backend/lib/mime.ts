/**
 * Just enough MIME to show what the local mail catcher received: headers, the plain-text
 * body and the attachments with their sizes (RFC 2045-2047, 2231). It reads what nodemailer
 * writes; it is not a general mail parser.
 */

export type ParsedAttachment = { fileName: string; contentType: string; content: Buffer };
export type ParsedMail = {
  headers: Map<string, string>;
  subject: string;
  text: string;
  attachments: ParsedAttachment[];
};

type Part = { headers: Map<string, string>; body: Buffer };

function splitHead(raw: Buffer): Part {
  let at = raw.indexOf("\r\n\r\n");
  let sep = 4;
  if (at < 0) {
    at = raw.indexOf("\n\n");
    sep = 2;
  }
  const head = at < 0 ? raw.toString("latin1") : raw.subarray(0, at).toString("latin1");
  const body = at < 0 ? Buffer.alloc(0) : raw.subarray(at + sep);
  const headers = new Map<string, string>();
  let last: string | null = null;
  for (const line of head.split(/\r?\n/)) {
    if (/^[ \t]/.test(line) && last) {
      headers.set(last, `${headers.get(last)} ${line.trim()}`);
      continue;
    }
    const colon = line.indexOf(":");
    if (colon <= 0) continue;
    last = line.slice(0, colon).trim().toLowerCase();
    const value = line.slice(colon + 1).trim();
    // the first occurrence wins (Received: lines repeat; we read none of them)
    if (!headers.has(last)) headers.set(last, value);
  }
  return { headers, body };
}

/** `type/sub; a=b; c="d"` → the value and its parameters (RFC 2231 `name*=utf-8''…` decoded). */
export function headerParams(value: string): { value: string; params: Record<string, string> } {
  const parts = value.match(/(?:[^;"]+|"(?:[^"\\]|\\.)*")+/g) ?? [];
  const out: Record<string, string> = {};
  const continued: Record<string, string[]> = {};
  for (const p of parts.slice(1)) {
    const eq = p.indexOf("=");
    if (eq < 0) continue;
    let key = p.slice(0, eq).trim().toLowerCase();
    let v = p.slice(eq + 1).trim();
    if (v.startsWith('"')) v = v.slice(1, -1).replace(/\\(.)/g, "$1");
    const m = /^(.+?)\*(\d+)?(\*)?$/.exec(key);
    if (m) {
      key = m[1];
      (continued[key] ??= [])[Number(m[2] ?? 0)] = v;
      continue;
    }
    out[key] = decodeWords(v);
  }
  for (const [key, pieces] of Object.entries(continued)) {
    const joined = pieces.join("");
    const m = /^([^']*)'[^']*'(.*)$/.exec(joined);
    out[key] = m ? decodePercent(m[2], m[1] || "utf-8") : joined;
  }
  return { value: (parts[0] ?? "").trim().toLowerCase(), params: out };
}

function decodePercent(s: string, charset: string): string {
  const bytes: number[] = [];
  for (let i = 0; i < s.length; i++) {
    if (s[i] === "%" && /^[0-9a-f]{2}$/i.test(s.slice(i + 1, i + 3))) {
      bytes.push(parseInt(s.slice(i + 1, i + 3), 16));
      i += 2;
    } else bytes.push(s.charCodeAt(i));
  }
  return decodeCharset(Buffer.from(bytes), charset);
}

function decodeCharset(buf: Buffer, charset: string): string {
  const c = charset.toLowerCase();
  if (c === "utf-8" || c === "utf8" || c === "us-ascii") return buf.toString("utf8");
  if (c === "iso-8859-1" || c === "latin1") return buf.toString("latin1");
  try {
    return new TextDecoder(c).decode(buf);
  } catch {
    return buf.toString("utf8");
  }
}

function decodeQ(s: string, header: boolean): Buffer {
  const src = header ? s.replace(/_/g, " ") : s.replace(/=\r?\n/g, "");
  const bytes: number[] = [];
  for (let i = 0; i < src.length; i++) {
    if (src[i] === "=" && /^[0-9a-f]{2}$/i.test(src.slice(i + 1, i + 3))) {
      bytes.push(parseInt(src.slice(i + 1, i + 3), 16));
      i += 2;
    } else bytes.push(src.charCodeAt(i) & 0xff);
  }
  return Buffer.from(bytes);
}

/** RFC 2047 encoded words (`=?UTF-8?Q?…?=`, `=?UTF-8?B?…?=`); adjacent words join without the space between them. */
export function decodeWords(s: string): string {
  return s
    .replace(/(=\?[^?]+\?[bqBQ]\?[^?]*\?=)\s+(?==\?)/g, "$1")
    .replace(/=\?([^?]+)\?([bqBQ])\?([^?]*)\?=/g, (_m, charset: string, enc: string, text: string) =>
      decodeCharset(enc.toUpperCase() === "B" ? Buffer.from(text, "base64") : decodeQ(text, true), charset),
    );
}

function decodeBody(part: Part): Buffer {
  const enc = (part.headers.get("content-transfer-encoding") ?? "7bit").toLowerCase();
  if (enc === "base64") return Buffer.from(part.body.toString("latin1").replace(/[^A-Za-z0-9+/=]/g, ""), "base64");
  if (enc === "quoted-printable") return decodeQ(part.body.toString("latin1"), false);
  return part.body;
}

function splitMultipart(body: Buffer, boundary: string): Buffer[] {
  const text = body.toString("latin1");
  const marker = `--${boundary}`;
  const out: Buffer[] = [];
  let pos = text.indexOf(marker);
  while (pos >= 0) {
    const after = pos + marker.length;
    if (text.startsWith("--", after)) break;
    const start = text.indexOf("\n", after);
    if (start < 0) break;
    const next = text.indexOf(`\n${marker}`, start);
    const end = next < 0 ? text.length : next;
    // drop the CR before the next boundary's line break
    const chunk = text.slice(start + 1, end).replace(/\r$/, "");
    out.push(Buffer.from(chunk, "latin1"));
    pos = next < 0 ? -1 : next + 1;
  }
  return out;
}

function walk(part: Part, into: ParsedMail, depth: number) {
  const ct = headerParams(part.headers.get("content-type") ?? "text/plain");
  if (ct.value.startsWith("multipart/") && ct.params.boundary && depth < 10) {
    for (const chunk of splitMultipart(part.body, ct.params.boundary)) walk(splitHead(chunk), into, depth + 1);
    return;
  }
  const disp = headerParams(part.headers.get("content-disposition") ?? "");
  const fileName = disp.params.filename ?? ct.params.name;
  const content = decodeBody(part);
  if (disp.value === "attachment" || (fileName && !ct.value.startsWith("text/"))) {
    into.attachments.push({ fileName: fileName ?? "attachment", contentType: ct.value || "application/octet-stream", content });
    return;
  }
  if (ct.value === "text/plain" && !into.text) into.text = decodeCharset(content, ct.params.charset ?? "utf-8");
}

export function parseMail(raw: Buffer): ParsedMail {
  const top = splitHead(raw);
  const mail: ParsedMail = { headers: top.headers, subject: decodeWords(top.headers.get("subject") ?? ""), text: "", attachments: [] };
  walk(top, mail, 0);
  return mail;
}
