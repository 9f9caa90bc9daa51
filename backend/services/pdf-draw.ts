/**
 * Drawing primitives for our PDFs on top of pdfkit: Manrope with a Greek and a symbol
 * fallback chosen per character, single-line text with alignment and ellipsis, and wrapped
 * paragraphs. Everything is placed explicitly (the document has no margins), so nothing
 * flows onto a page by surprise.
 */
import { existsSync, readFileSync } from "node:fs";
import { createRequire } from "node:module";
import { inflateSync } from "node:zlib";
import PDFDocument from "pdfkit";
import { KIND_COLOUR, PALETTE } from "@shared/palette";

export type Doc = PDFKit.PDFDocument;
export type Weight = "regular" | "medium" | "bold" | "heavy";

export const INK: string = PALETTE.ink;
export const PAPER: string = PALETTE.paper;
export const LINE: string = PALETTE.line;
export const COLOURS = { ...KIND_COLOUR, pass: PALETTE.pass, fail: PALETTE.fail };
export const MUTED = "#5d6670";
export const FAINT = "#8a9099";

const require = createRequire(import.meta.url);
const fontFile = (name: string) => require.resolve(`@fontsource/manrope/files/${name}`);
// Debian ships DejaVu with fontconfig; it only supplies the few signs Manrope lacks (≥, ≤, ≈).
const SYMBOL_FONT = "/usr/share/fonts/truetype/dejavu/DejaVuSans.ttf";

/**
 * WOFF 1.0 → plain TrueType, once per process: fontkit would otherwise inflate every table
 * in JavaScript for each document, which costs seconds per report.
 */
export function woffToSfnt(woff: Buffer): Buffer {
  if (woff.toString("latin1", 0, 4) !== "wOFF") return woff;
  const numTables = woff.readUInt16BE(12);
  const tables: Array<{ tag: Buffer; checksum: number; data: Buffer }> = [];
  for (let i = 0; i < numTables; i++) {
    const at = 44 + i * 20;
    const offset = woff.readUInt32BE(at + 4);
    const compLength = woff.readUInt32BE(at + 8);
    const origLength = woff.readUInt32BE(at + 12);
    const raw = woff.subarray(offset, offset + compLength);
    tables.push({
      tag: woff.subarray(at, at + 4),
      checksum: woff.readUInt32BE(at + 16),
      data: compLength < origLength ? inflateSync(raw) : Buffer.from(raw),
    });
  }
  const entrySelector = Math.floor(Math.log2(numTables));
  const searchRange = 2 ** entrySelector * 16;
  const head = Buffer.alloc(12 + numTables * 16);
  woff.copy(head, 0, 4, 8);
  head.writeUInt16BE(numTables, 4);
  head.writeUInt16BE(searchRange, 6);
  head.writeUInt16BE(entrySelector, 8);
  head.writeUInt16BE(numTables * 16 - searchRange, 10);
  const bodies: Buffer[] = [];
  let offset = head.length;
  tables.forEach((t, i) => {
    const rec = 12 + i * 16;
    t.tag.copy(head, rec);
    head.writeUInt32BE(t.checksum, rec + 4);
    head.writeUInt32BE(offset, rec + 8);
    head.writeUInt32BE(t.data.length, rec + 12);
    const padded = Buffer.alloc(Math.ceil(t.data.length / 4) * 4);
    t.data.copy(padded);
    bodies.push(padded);
    offset += padded.length;
  });
  return Buffer.concat([head, ...bodies]);
}

let cache: { latin: Record<Weight, Buffer>; greek: Record<Weight, Buffer>; symbol: Buffer | null } | null = null;
function fonts() {
  if (!cache) {
    const w: Record<Weight, string> = { regular: "400", medium: "600", bold: "700", heavy: "800" };
    const load = (subset: string) =>
      Object.fromEntries(
        Object.entries(w).map(([k, v]) => [k, woffToSfnt(readFileSync(fontFile(`manrope-${subset}-${v}-normal.woff`)))]),
      ) as Record<Weight, Buffer>;
    cache = { latin: load("latin"), greek: load("greek"), symbol: existsSync(SYMBOL_FONT) ? readFileSync(SYMBOL_FONT) : null };
  }
  return cache;
}

export function createDoc(info: { title: string; subject: string; date: Date }): Doc {
  const doc = new PDFDocument({
    size: "A4",
    margin: 0,
    bufferPages: true,
    autoFirstPage: true,
    info: {
      Title: info.title,
      Subject: info.subject,
      Author: "Orthostack",
      Creator: "Orthostack",
      Producer: "Orthostack",
      CreationDate: info.date,
    },
  });
  const f = fonts();
  for (const wt of Object.keys(f.latin) as Weight[]) {
    doc.registerFont(`latin-${wt}`, f.latin[wt]);
    doc.registerFont(`greek-${wt}`, f.greek[wt]);
  }
  if (f.symbol) doc.registerFont("symbol", f.symbol);
  return doc;
}

export function finish(doc: Doc): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    doc.on("data", (c: Buffer) => chunks.push(c));
    doc.on("end", () => resolve(Buffer.concat(chunks)));
    doc.on("error", reject);
    doc.end();
  });
}

type Run = { text: string; font: string };

const ASCII_FOR: Record<string, string> = { "≥": ">=", "≤": "<=", "≈": "~" };

/** Splits a string into runs of one font each: Manrope latin, Manrope Greek, or the symbol font. */
function runsOf(text: string, weight: Weight): Run[] {
  const hasSymbol = fonts().symbol !== null;
  const out: Run[] = [];
  for (const ch of text) {
    const cp = ch.codePointAt(0)!;
    let font = `latin-${weight}`;
    let t = ch;
    if (cp <= 0xff || (cp >= 0x2000 && cp <= 0x206f) || cp === 0x2212 || cp === 0x20ac || cp === 0x2122) font = `latin-${weight}`;
    else if (cp >= 0x0370 && cp <= 0x03ff) font = `greek-${weight}`;
    else if (hasSymbol) font = "symbol";
    else t = ASCII_FOR[ch] ?? "?";
    const last = out[out.length - 1];
    if (last && last.font === font) last.text += t;
    else out.push({ text: t, font });
  }
  return out;
}

export type TextStyle = { size: number; weight?: Weight; color?: string; tracking?: number; opacity?: number };

// Widths at 1 pt, kept across documents: shaping is the costly part of a report, and the
// same words are measured again and again (wrapping, ellipsis, alignment).
const widths = new Map<string, number>();
const WIDTH_CACHE_MAX = 50_000;

function runWidth(doc: Doc, r: Run): number {
  const key = `${r.font}\u0000${r.text}`;
  let w = widths.get(key);
  if (w === undefined) {
    doc.font(r.font).fontSize(1);
    w = doc.widthOfString(r.text);
    if (widths.size >= WIDTH_CACHE_MAX) widths.clear();
    widths.set(key, w);
  }
  return w;
}

export function measure(doc: Doc, text: string, style: TextStyle): number {
  let w = 0;
  for (const r of runsOf(text, style.weight ?? "regular")) {
    w += runWidth(doc, r) * style.size + (style.tracking ?? 0) * Math.max(0, [...r.text].length - 1);
  }
  return w;
}

function ellipsize(doc: Doc, text: string, style: TextStyle, width: number): string {
  if (measure(doc, text, style) <= width) return text;
  let lo = 0;
  let hi = text.length;
  while (lo < hi) {
    const mid = Math.ceil((lo + hi) / 2);
    if (measure(doc, `${text.slice(0, mid)}…`, style) <= width) lo = mid;
    else hi = mid - 1;
  }
  return `${text.slice(0, lo).trimEnd()}…`;
}

/** One line of text at (x, y) = top-left of the line box; align within `width` when given. */
export function text(
  doc: Doc,
  value: string,
  x: number,
  y: number,
  style: TextStyle & { width?: number; align?: "left" | "right" | "center" },
) {
  const s = style.width ? ellipsize(doc, value, style, style.width) : value;
  const w = measure(doc, s, style);
  let cx = x;
  if (style.width && style.align === "right") cx = x + style.width - w;
  else if (style.width && style.align === "center") cx = x + (style.width - w) / 2;
  doc.save();
  if (style.opacity !== undefined) doc.fillOpacity(style.opacity);
  doc.fillColor(style.color ?? INK);
  for (const r of runsOf(s, style.weight ?? "regular")) {
    doc.font(r.font).fontSize(style.size);
    doc.text(r.text, cx, y, { lineBreak: false, characterSpacing: style.tracking ?? 0 });
    cx += runWidth(doc, r) * style.size + (style.tracking ?? 0) * [...r.text].length;
  }
  doc.restore();
  return w;
}

/**
 * A word wider than the line in pieces that fit, broken after a dot, dash, underscore or
 * slash where one falls in the piece (source ids such as "accel.bondLine"), else anywhere:
 * names wrap, they are never cut off.
 */
function breakWord(doc: Doc, word: string, style: TextStyle, width: number): string[] {
  if (width <= 0 || measure(doc, word, style) <= width) return [word];
  const out: string[] = [];
  let rest = word;
  while (rest && measure(doc, rest, style) > width) {
    let n = 1;
    while (n < rest.length && measure(doc, rest.slice(0, n + 1), style) <= width) n++;
    const soft = Math.max(...[".", "-", "_", "/"].map((ch) => rest.lastIndexOf(ch, n - 1)));
    const at = soft > 0 ? soft + 1 : n;
    out.push(rest.slice(0, at));
    rest = rest.slice(at);
  }
  if (rest) out.push(rest);
  return out;
}

/** Word-wrapped text; returns its height. Blank lines in `value` separate paragraphs. */
export function paragraph(
  doc: Doc,
  value: string,
  x: number,
  y: number,
  width: number,
  style: TextStyle & { lineHeight?: number },
  draw = true,
): number {
  const lh = style.lineHeight ?? style.size * 1.42;
  const space = measure(doc, " ", style);
  let cy = y;
  const paras = value.split(/\n/);
  paras.forEach((para, pi) => {
    const words = para.split(/\s+/).filter(Boolean);
    let line: string[] = [];
    let lw = 0;
    const flush = () => {
      if (draw && line.length) text(doc, line.join(" "), x, cy, style);
      cy += lh;
      line = [];
      lw = 0;
    };
    for (const word of words.flatMap((w) => breakWord(doc, w, style, width))) {
      const ww = measure(doc, word, style);
      if (line.length && lw + space + ww > width) flush();
      lw += (line.length ? space : 0) + ww;
      line.push(word);
    }
    if (line.length || words.length === 0) flush();
    if (pi < paras.length - 1 && para === "") cy += lh * 0.2;
  });
  return cy - y;
}

export function rule(doc: Doc, x1: number, y: number, x2: number, color = LINE, width = 0.6) {
  doc.save().moveTo(x1, y).lineTo(x2, y).lineWidth(width).strokeColor(color).stroke().restore();
}

export function box(
  doc: Doc,
  x: number,
  y: number,
  w: number,
  h: number,
  opts: { fill?: string; stroke?: string; radius?: number; lineWidth?: number; fillOpacity?: number },
) {
  doc.save();
  if (opts.radius) doc.roundedRect(x, y, w, h, opts.radius);
  else doc.rect(x, y, w, h);
  if (opts.fillOpacity !== undefined) doc.fillOpacity(opts.fillOpacity);
  if (opts.fill && opts.stroke) doc.lineWidth(opts.lineWidth ?? 0.6).fillAndStroke(opts.fill, opts.stroke);
  else if (opts.fill) doc.fill(opts.fill);
  else if (opts.stroke)
    doc
      .lineWidth(opts.lineWidth ?? 0.6)
      .strokeColor(opts.stroke)
      .stroke();
  doc.restore();
}
