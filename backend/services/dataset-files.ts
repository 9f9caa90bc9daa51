/**
 * Reading an uploaded measurement file (CSV or XLSX) into checked columns. Everything that
 * cannot be read is refused here, before anything is stored, with the row and the column
 * it was found in (the header is the file's first non-blank row; rows count as a
 * spreadsheet shows them, from 1).
 */
import { DATASET_MAX_COLUMNS, DATASET_MAX_ROWS, DATASET_PREVIEW_ROWS, type ParsedColumn } from "@shared/schemas/datasets";
import { parseHeader, type MeasureUnit } from "@shared/datasets/units";
import { summarize } from "@shared/datasets/statistics";
import { badRequest, type HttpError, type FieldError } from "../lib/errors";
import { readXlsx } from "./dataset-xlsx";
import { formatCount } from "@shared/format";
import { parse as parseCsv, CsvError } from "csv-parse/sync";

/** How many problems one refusal lists; the message names the first. */
const MAX_LISTED = 20;

export type CellKind = "empty" | "number" | "text" | "date" | "bool" | "error" | "formula";
export type Cell = { kind: CellKind; text: string; value: number | null };
export type RawRow = { row: number; cells: Cell[] };
export type RawTable = { fileType: "csv" | "xlsx"; sheet: string | null; rows: RawRow[] };

/** A column read from the file (summary n: values; missing: gaps, empty cells and missing markers). */
export type { ParsedColumn };

export type ParsedDataset = {
  fileType: "csv" | "xlsx";
  sheet: string | null;
  columns: ParsedColumn[];
  /** null marks a gap in a measured column */
  data: Record<string, Array<number | string | null>>;
  rowNumbers: number[];
  preview: { rowNumbers: number[]; cells: string[][] };
};

export const EMPTY: Cell = { kind: "empty", text: "", value: null };

/** What metrology exports write for "no value": a gap in a measured column, not an error. */
export const MISSING_MARKERS = ["NA", "N/A", "n/a", "-", "null"] as const;
const MISSING = new Set<string>(MISSING_MARKERS.map((m) => m.toLowerCase()));
export const isMissingMarker = (text: string) => MISSING.has(text.trim().toLowerCase());

export function columnLetter(index: number): string {
  let s = "";
  let n = index + 1;
  while (n > 0) {
    const r = (n - 1) % 26;
    s = String.fromCharCode(65 + r) + s;
    n = Math.floor((n - 1) / 26);
  }
  return s;
}

const where = (row: number, col: number, header?: string) => `Row ${row}, column ${columnLetter(col)}${header ? ` (${header})` : ""}`;

export const invalid = (message: string, fields?: FieldError[], code = "invalid_file") => badRequest(message, fields, code);

/** One message naming the first problem, every problem (up to a limit) in `fields`. */
function refuse(problems: { at: string; message: string }[]): HttpError {
  const first = problems[0];
  const more =
    problems.length > 1
      ? ` (${problems.length > MAX_LISTED ? `${MAX_LISTED}+` : problems.length} problems; nothing was stored)`
      : " Nothing was stored.";
  return invalid(
    `${first.at}: ${first.message}.${more}`,
    problems.slice(0, MAX_LISTED).map((p) => ({ path: p.at, message: p.message })),
  );
}

// ---------------------------------------------------------------- numbers

const NUMBER = /^[+-]?(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?$/;

/** A decimal number as people write it; `decimalComma` also takes "0,12" (semicolon or tab files). */
export function parseNumber(text: string, decimalComma = false): number | null {
  let t = text.trim().replace(/^\u2212/, "-");
  if (decimalComma && /^[+-]?\d*,\d+([eE][+-]?\d+)?$/.test(t)) t = t.replace(",", ".");
  if (!NUMBER.test(t)) return null;
  const v = Number(t);
  return Number.isFinite(v) ? v : null;
}

// ---------------------------------------------------------------- CSV

function decodeText(buf: Buffer): string {
  try {
    return new TextDecoder("utf-8", { fatal: true }).decode(buf).replace(/^\uFEFF/, "");
  } catch {
    // Spreadsheet programs on Windows save "CSV" in the ANSI code page (µ is 0xB5 there).
    return new TextDecoder("windows-1252").decode(buf);
  }
}

/** The delimiter that splits the first line most often, outside quotes: comma, semicolon or tab. */
function sniffDelimiter(text: string): string {
  const counts: Record<string, number> = { ",": 0, ";": 0, "\t": 0 };
  let quoted = false;
  for (let i = 0; i < text.length; i++) {
    const c = text[i];
    if (c === '"') quoted = !quoted;
    else if (!quoted && (c === "\n" || c === "\r")) {
      if (counts[","] + counts[";"] + counts["\t"] > 0) break;
    } else if (!quoted && c in counts) counts[c]++;
  }
  if (counts[";"] > counts[","] && counts[";"] >= counts["\t"]) return ";";
  if (counts["\t"] > counts[","] && counts["\t"] > counts[";"]) return "\t";
  return ",";
}

/**
 * RFC 4180 records (csv-parse): fields split by the delimiter, double quotes around a field that
 * holds delimiters, quotes ("" inside) or line breaks; CRLF, LF or CR line ends. Spaces may sit
 * around a quoted field; a quote inside an unquoted field is kept as text; a blank line is a
 * record of one empty field, so row numbers stay those a spreadsheet shows.
 */
export function parseCsvRecords(text: string, delimiter: string, maxRecords: number): { records: string[][]; more: boolean } {
  let records: string[][];
  try {
    records = parseCsv(text, {
      delimiter,
      record_delimiter: ["\r\n", "\n", "\r"],
      relax_column_count: true,
      relax_quotes: true,
      ltrim: true,
      rtrim: true,
      skip_empty_lines: false,
      // one past the limit tells that the limit is passed
      to: maxRecords + 1,
    });
  } catch (e) {
    throw csvRefusal(e);
  }
  if (records.length > maxRecords) return { records: records.slice(0, maxRecords), more: true };
  return { records, more: false };
}

/** csv-parse's error as our refusal, naming the row (records before it + 1) and the column. */
function csvRefusal(e: unknown): unknown {
  if (!(e instanceof CsvError)) return e;
  const before = typeof e.records === "number" ? e.records : 0;
  const at = `Row ${before + 1}, column ${columnLetter(typeof e.index === "number" ? e.index : 0)}`;
  switch (e.code) {
    case "CSV_QUOTE_NOT_CLOSED":
      return invalid(`${at}: a quoted field is not closed (a " is missing). Nothing was stored.`);
    case "CSV_INVALID_CLOSING_QUOTE":
    case "CSV_NON_TRIMABLE_CHAR_AFTER_CLOSING_QUOTE":
      return invalid(`${at}: text after the closing quote of a quoted field. Nothing was stored.`);
    default:
      return invalid(`${at}: the line cannot be read as CSV (${e.message}). Nothing was stored.`);
  }
}

function readCsv(buf: Buffer): RawTable {
  const text = decodeText(buf);
  const delimiter = sniffDelimiter(text);
  const decimalComma = delimiter !== ",";
  // header + the row limit + one more to notice that the limit is passed (blank rows aside)
  const { records, more } = parseCsvRecords(text, delimiter, 4 * (DATASET_MAX_ROWS + 1));
  if (more) throw tooManyRows();
  const rows: RawRow[] = records.map((r, k) => ({
    row: k + 1,
    cells: r.map((raw): Cell => {
      const t = raw.trim();
      if (t === "") return EMPTY;
      const v = parseNumber(t, decimalComma);
      return v === null ? { kind: "text", text: t, value: null } : { kind: "number", text: t, value: v };
    }),
  }));
  return { fileType: "csv", sheet: null, rows };
}

/** Cells holding a NUL character (PostgreSQL stores none in text): the first few, by row and column. */
function nulCells(rows: RawRow[]): { at: string; message: string }[] {
  const out: { at: string; message: string }[] = [];
  for (const r of rows)
    for (let k = 0; k < r.cells.length && out.length <= MAX_LISTED; k++)
      if (r.cells[k].text.includes("\u0000")) out.push({ at: where(r.row, k), message: "the cell holds a NUL character (\\u0000)" });
  return out;
}

export const tooManyColumns = (col: number) =>
  invalid(
    `The file has values in column ${columnLetter(col - 1)}; at most ${DATASET_MAX_COLUMNS} columns are accepted. Nothing was stored.`,
  );

export const tooManyRows = () =>
  invalid(
    `The file has more than ${formatCount(DATASET_MAX_ROWS)} data rows, the most one data set may hold. Nothing was stored.`,
    undefined,
    "too_many_rows",
  );

// ---------------------------------------------------------------- the file as a whole

const XLSX_MAGIC = Buffer.from([0x50, 0x4b, 0x03, 0x04]);
const OLE_MAGIC = Buffer.from([0xd0, 0xcf, 0x11, 0xe0, 0xa1, 0xb1, 0x1a, 0xe1]);

/** Which reader a file needs, from its content first and its name second. */
export function fileTypeOf(name: string, buf: Buffer): "csv" | "xlsx" {
  const lower = name.toLowerCase();
  if (buf.subarray(0, 4).equals(XLSX_MAGIC)) {
    if (lower.endsWith(".xlsx") || lower.endsWith(".xlsm") || !/\.[a-z0-9]+$/.test(lower)) return "xlsx";
    throw invalid(
      `“${name}” is a zip archive, not a measurement file. Upload a CSV file (.csv) or an Excel workbook (.xlsx). Nothing was stored.`,
      undefined,
      "wrong_file_type",
    );
  }
  if (buf.subarray(0, 8).equals(OLE_MAGIC)) {
    throw invalid(
      `“${name}” is an old-style Excel file (.xls). Save it as an Excel workbook (.xlsx) or as CSV and upload that. Nothing was stored.`,
      undefined,
      "wrong_file_type",
    );
  }
  if (lower.endsWith(".xlsx"))
    throw invalid(`“${name}” is named .xlsx but is not an Excel workbook. Nothing was stored.`, undefined, "wrong_file_type");
  const ext = /\.([a-z0-9]+)$/.exec(lower)?.[1];
  const textExt = ext === undefined || ["csv", "txt", "tsv", "tab", "dat"].includes(ext);
  // A text file has no NUL bytes; PDFs, images and the like do, or carry another name.
  const binary = buf.subarray(0, 8192).includes(0);
  if (binary || !textExt) {
    throw invalid(
      `“${name}” is not a CSV file or an Excel workbook. Upload a .csv or .xlsx file. Nothing was stored.`,
      undefined,
      "wrong_file_type",
    );
  }
  return "csv";
}

// Names of columns that identify a unit rather than measure it.
const LABEL_HEADER =
  /^(id|unit|units|unit ?id|unit ?no\.?|serial|serial ?no\.?|serial ?number|s\/?n|sample|sample ?id|part|part ?no\.?|lot|lot ?id|batch|label|name|die|die ?id|site|position|date|time|operator|comment|comments|note|notes)$/i;

/** Reads and checks the whole file; throws a 400 naming the row and column of the first problem. */
export async function readMeasurementFile(name: string, buf: Buffer): Promise<ParsedDataset> {
  if (buf.length === 0) throw invalid(`“${name}” is empty. Nothing was stored.`, undefined, "empty_file");
  const fileType = fileTypeOf(name, buf);
  const table = fileType === "xlsx" ? await readXlsx(buf) : readCsv(buf);
  const nonBlank = table.rows.filter((r) => r.cells.some((c) => c.kind !== "empty"));
  if (nonBlank.length === 0)
    throw invalid(
      `“${name}” holds no data: the ${fileType === "xlsx" ? "sheet" : "file"} is empty. Nothing was stored.`,
      undefined,
      "empty_file",
    );
  const nul = nulCells(nonBlank);
  if (nul.length) throw refuse(nul);
  const [headerRow, ...dataRows] = nonBlank;
  if (dataRows.length > DATASET_MAX_ROWS) throw tooManyRows();
  const hr = headerRow.row;
  if (dataRows.length === 0)
    throw invalid(`Row ${hr + 1}: the file has a header but no data rows. Nothing was stored.`, undefined, "empty_file");

  // Columns: the header's cells, plus any column that has data further down.
  let width = headerRow.cells.length;
  for (const r of dataRows) {
    for (let k = r.cells.length - 1; k >= width; k--) {
      if (r.cells[k].kind !== "empty") {
        width = k + 1;
        break;
      }
    }
  }
  while (
    width > 0 &&
    (headerRow.cells[width - 1] ?? EMPTY).kind === "empty" &&
    dataRows.every((r) => (r.cells[width - 1] ?? EMPTY).kind === "empty")
  )
    width--;
  if (width > DATASET_MAX_COLUMNS)
    throw invalid(`The file has ${width} columns; at most ${DATASET_MAX_COLUMNS} are accepted. Nothing was stored.`);

  const problems: { at: string; message: string }[] = [];
  const seen = new Map<string, number>();
  type Col = { index: number; key: string; name: string; unit: MeasureUnit | null; kind: "number" | "label" };
  const cols: Col[] = [];
  for (let k = 0; k < width; k++) {
    const h = headerRow.cells[k] ?? EMPTY;
    const hasData = dataRows.some((r) => (r.cells[k] ?? EMPTY).kind !== "empty");
    if (h.kind === "empty") {
      if (hasData) problems.push({ at: where(hr, k), message: "the column has values but no header" });
      continue;
    }
    const key = h.text.trim();
    if (key === "__proto__" || parseHeader(key).name === "__proto__") {
      problems.push({ at: where(hr, k, key), message: "“__proto__” cannot name a column: rename it" });
      continue;
    }
    const prev = seen.get(key.toLowerCase());
    if (prev !== undefined) {
      problems.push({ at: where(hr, k, key), message: `the header “${key}” is already used by column ${columnLetter(prev)}` });
      continue;
    }
    seen.set(key.toLowerCase(), k);
    const ph = parseHeader(key);
    if (ph.strict && !ph.unit) {
      problems.push({
        at: where(hr, k, key),
        message: ph.unitText
          ? `unknown unit “${ph.unitText}” in the header: use um, mm, deg, mrad or arcmin`
          : "the brackets in the header hold no unit: use um, mm, deg, mrad or arcmin",
      });
      continue;
    }
    if (!hasData) {
      problems.push({ at: where(hr + 1, k, key), message: "missing value: the column is empty" });
      continue;
    }
    let kind: "number" | "label";
    if (ph.unit) kind = "number";
    else if (LABEL_HEADER.test(ph.name)) kind = "label";
    else {
      // the first cell that holds something other than a gap decides
      const first = dataRows
        .map((r) => r.cells[k] ?? EMPTY)
        .find((c) => c.kind !== "empty" && !(c.kind === "text" && isMissingMarker(c.text)));
      kind = first?.kind === "number" ? "number" : "label";
    }
    cols.push({ index: k, key, name: ph.name, unit: ph.unit, kind });
  }
  if (problems.length === 0 && !cols.some((c) => c.kind === "number")) {
    problems.push({
      at: `Row ${hr}`,
      message: "no column holds numbers: give each measured quantity its own column, with its unit in the header, e.g. “tilt_x [deg]”",
    });
  }
  if (problems.length) throw refuse(problems);

  const data: Record<string, Array<number | string | null>> = {};
  for (const c of cols) {
    const values: Array<number | string | null> = new Array(dataRows.length);
    for (let r = 0; r < dataRows.length; r++) {
      const cell = dataRows[r].cells[c.index] ?? EMPTY;
      if (c.kind === "label") {
        values[r] = cell.text;
        continue;
      }
      const at = where(dataRows[r].row, c.index, c.key);
      if (cell.kind === "number") values[r] = cell.value!;
      else if (cell.kind === "empty" || (cell.kind === "text" && isMissingMarker(cell.text))) values[r] = null;
      else if (cell.kind === "date") problems.push({ at, message: `holds a date (${cell.text}), not a number` });
      else if (cell.kind === "error") problems.push({ at, message: `holds the spreadsheet error ${cell.text}, not a number` });
      else if (cell.kind === "bool") problems.push({ at, message: `holds ${cell.text}, not a number` });
      else if (cell.kind === "formula") problems.push({ at, message: `holds the formula ${cell.text} with no number saved as its result` });
      else problems.push({ at, message: `“${cell.text.length > 40 ? `${cell.text.slice(0, 40)}…` : cell.text}” is not a number` });
      if (problems.length > MAX_LISTED) break;
    }
    if (problems.length > MAX_LISTED) break;
    if (c.kind === "number" && !values.some((v) => v !== null)) {
      problems.push({ at: where(hr, c.index, c.key), message: "the column holds only gaps (empty or NA), no value" });
    }
    data[c.key] = values;
  }
  if (problems.length) throw refuse(problems);

  const previewRows = dataRows.slice(0, DATASET_PREVIEW_ROWS);
  return {
    fileType,
    sheet: table.sheet,
    columns: cols.map((c) => {
      let summary: ParsedColumn["summary"] = null;
      if (c.kind === "number") {
        const present = (data[c.key] as Array<number | null>).filter((v): v is number => v !== null);
        const s = summarize(present);
        summary = { n: s.n, missing: dataRows.length - s.n, mean: s.mean, std: s.std, min: s.min, max: s.max };
      }
      return { key: c.key, name: c.name, letter: columnLetter(c.index), unit: c.unit, kind: c.kind, summary };
    }),
    data,
    rowNumbers: dataRows.map((r) => r.row),
    preview: {
      rowNumbers: previewRows.map((r) => r.row),
      cells: previewRows.map((r) => cols.map((c) => (r.cells[c.index] ?? EMPTY).text)),
    },
  };
}
