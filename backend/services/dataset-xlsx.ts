/**
 * Reading an uploaded Excel workbook (.xlsx) into raw rows for dataset-files.ts, bounded by the
 * bytes it really inflates to and by the rows (blank ones too) and columns it holds.
 */
import { Readable } from "node:stream";
import ExcelJS from "exceljs";
import { Unzip, UnzipInflate } from "fflate";
import { DATASET_MAX_COLUMNS, DATASET_MAX_ROWS } from "@shared/schemas/datasets";
import { HttpError } from "../lib/errors";
import { EMPTY, invalid, parseNumber, tooManyColumns, tooManyRows, type Cell, type RawRow, type RawTable } from "./dataset-files";

/** Refuse a workbook whose parts unpack to more than this (a small zip can hold a huge sheet). */
export const MAX_XLSX_UNPACKED = 120 * 1024 * 1024;

/** Sum of the unpacked sizes in a zip's central directory; null if it cannot be read. */
function zipUnpackedSize(buf: Buffer): number | null {
  const min = Math.max(0, buf.length - 22 - 0xffff);
  for (let p = buf.length - 22; p >= min; p--) {
    if (buf.readUInt32LE(p) !== 0x06054b50) continue;
    const count = buf.readUInt16LE(p + 10);
    let q = buf.readUInt32LE(p + 16);
    let total = 0;
    for (let k = 0; k < count; k++) {
      if (q + 46 > buf.length || buf.readUInt32LE(q) !== 0x02014b50) return null;
      const size = buf.readUInt32LE(q + 24);
      if (size === 0xffffffff) return null;
      total += size;
      q += 46 + buf.readUInt16LE(q + 28) + buf.readUInt16LE(q + 30) + buf.readUInt16LE(q + 32);
    }
    return total;
  }
  return null;
}

/**
 * Whether the zip's entries inflate to more than `limit` bytes, counted on the bytes actually
 * inflated (a zip's directory can lie about its sizes). Fed in small pieces, so one piece cannot
 * inflate to more than about 16 MB, with a turn of the event loop between pieces; stops at the
 * limit. null: not a zip that can be read.
 */
export async function inflatesOver(buf: Buffer, limit: number): Promise<boolean | null> {
  let total = 0;
  let over = false;
  let failed = false;
  const unzip = new Unzip((file) => {
    file.ondata = (err, chunk) => {
      if (err) failed = true;
      else if ((total += chunk.length) > limit && !over) {
        over = true;
        file.terminate();
      }
    };
    file.start();
  });
  unzip.register(UnzipInflate);
  const PIECE = 16 * 1024;
  try {
    for (let p = 0; p < buf.length && !over && !failed; p += PIECE) {
      unzip.push(buf.subarray(p, p + PIECE), p + PIECE >= buf.length);
      if ((p / PIECE) % 16 === 15) await new Promise((r) => setImmediate(r));
    }
  } catch {
    failed = true;
  }
  if (over) return true;
  return failed ? null : false;
}

function cellOf(v: ExcelJS.CellValue): Cell {
  if (v === null || v === undefined) return EMPTY;
  if (typeof v === "number")
    return Number.isFinite(v) ? { kind: "number", text: String(v), value: v } : { kind: "error", text: String(v), value: null };
  if (typeof v === "string") {
    const t = v.trim();
    if (t === "") return EMPTY;
    const n = parseNumber(t);
    return n === null ? { kind: "text", text: t, value: null } : { kind: "number", text: t, value: n };
  }
  if (typeof v === "boolean") return { kind: "bool", text: v ? "TRUE" : "FALSE", value: null };
  if (v instanceof Date) return { kind: "date", text: Number.isNaN(v.getTime()) ? "" : v.toISOString().slice(0, 10), value: null };
  if (typeof v === "object") {
    if ("error" in v && v.error) return { kind: "error", text: String(v.error), value: null };
    if ("formula" in v || "sharedFormula" in v) {
      const r = (v as { result?: ExcelJS.CellValue }).result;
      if (r !== undefined && r !== null) return cellOf(r as ExcelJS.CellValue);
      // a formula whose result was not saved with it, or an error result the reader drops
      const f = (v as { formula?: string }).formula;
      return { kind: "formula", text: f ? `=${f}` : "a formula", value: null };
    }
    if ("richText" in v && Array.isArray(v.richText)) return cellOf(v.richText.map((p) => p.text).join(""));
    if ("text" in v) return cellOf(String((v as { text: unknown }).text));
  }
  return { kind: "text", text: String(v), value: null };
}

type StreamCell = { value: ExcelJS.CellValue };
type StreamRow = { number: number; eachCell: (opts: { includeEmpty: boolean }, fn: (cell: StreamCell, col: number) => void) => void };
type StreamSheet = AsyncIterable<StreamRow> & { name: string };

/**
 * Streams the workbook (exceljs' reader keeps one row at a time, about a tenth of the memory
 * of loading it whole) and stops at the first sheet that holds rows.
 */
export async function readXlsx(buf: Buffer): Promise<RawTable> {
  const unpacked = zipUnpackedSize(buf);
  if (unpacked === null) throw invalid("The file could not be read as an Excel workbook (.xlsx). Nothing was stored.");
  const tooBig = () =>
    invalid(
      `The workbook unpacks to more than the ${MAX_XLSX_UNPACKED / 1048576} MB accepted. Nothing was stored.`,
      [{ path: "file", message: `unpacks to more than ${MAX_XLSX_UNPACKED / 1048576} MB` }],
      "too_large",
    );
  if (unpacked > MAX_XLSX_UNPACKED) throw tooBig();
  // the directory's sizes are what the file says; count what it really inflates to
  const over = await inflatesOver(buf, MAX_XLSX_UNPACKED);
  if (over === null) throw invalid("The file could not be read as an Excel workbook (.xlsx). Nothing was stored.");
  if (over) throw tooBig();
  const reader = new ExcelJS.stream.xlsx.WorkbookReader(Readable.from(buf), {
    sharedStrings: "cache",
    hyperlinks: "ignore",
    styles: "cache",
    worksheets: "emit",
    entries: "emit",
  });
  const rows: RawRow[] = [];
  let sheet: string | null = null;
  let sheets = 0;
  // blank rows cost work too (a sheet of a million empty rows): counted against the same bound as CSV records
  let seen = 0;
  try {
    // exceljs's streaming reader is async-iterable at run time, but its type declarations do not say so
    for await (const ws of reader as unknown as AsyncIterable<StreamSheet>) {
      sheets++;
      for await (const r of ws) {
        if (++seen > 4 * (DATASET_MAX_ROWS + 1)) throw tooManyRows();
        const cells: Cell[] = [];
        // only the cells that hold something: a row's last column may be XFD (16,384 cells)
        r.eachCell({ includeEmpty: false }, (c, col) => {
          if (col > DATASET_MAX_COLUMNS + 1) throw tooManyColumns(col);
          cells[col - 1] = cellOf(c.value);
        });
        for (let k = 0; k < cells.length; k++) cells[k] ??= EMPTY;
        if (!cells.some((c) => c.kind !== "empty")) continue;
        rows.push({ row: r.number, cells });
        if (rows.length > DATASET_MAX_ROWS + 1) throw tooManyRows();
      }
      if (rows.length) {
        sheet = ws.name;
        break;
      }
    }
  } catch (err) {
    if (err instanceof HttpError) throw err;
    throw invalid("The file could not be read as an Excel workbook (.xlsx). Nothing was stored.");
  }
  if (sheets === 0) throw invalid("The workbook has no worksheet. Nothing was stored.", undefined, "empty_file");
  return { fileType: "xlsx", sheet, rows };
}
