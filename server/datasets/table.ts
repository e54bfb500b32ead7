// Reading a CSV or TSV dataset: the checks by content (text or not, which separator), the header,
// ragged rows and numbers, each problem with the line it is on. Pure (papaparse only), so the
// upload page runs the same checks in the browser that the server runs before storing anything.
import Papa from 'papaparse';
import type { ColumnRole, DatasetFormat } from '../../db/schema';

export type { ColumnRole, DatasetFormat };

export const MAX_DATASET_BYTES = 20 * 1024 * 1024;
/** Problems listed one by one; past this many only the count goes on. */
export const MAX_LISTED_ISSUES = 50;
export const PREVIEW_ROWS = 20;

export const delimiterOf: Record<DatasetFormat, string> = { csv: ',', tsv: '\t' };
export const formatWords: Record<DatasetFormat, string> = { csv: 'CSV (comma-separated)', tsv: 'TSV (tab-separated)' };

/** One problem in a file: where (1-based line, column header) and what. */
export interface TableIssue {
  line: number | null;
  column: string | null;
  message: string;
}

export interface ParsedColumn {
  header: string;
  /** Every cell of the column is a number (empty cells allowed only outside x, y and error bars). */
  numeric: boolean;
  values: (number | string | null)[];
}

export interface TableRead {
  format: DatasetFormat;
  header: string[];
  headerLine: number;
  columns: ParsedColumn[];
  /** The line each data row starts on. */
  lines: number[];
  rowCount: number;
  previewRows: string[][];
  issues: TableIssue[];
  /** All problems found, including those past MAX_LISTED_ISSUES. */
  issueCount: number;
}

const issue = (line: number | null, column: string | null, message: string): TableIssue => ({ line, column, message });

export function formatBytes(bytes: number): string {
  if (bytes < 1024) return `${bytes} bytes`;
  if (bytes < 1024 * 1024) return `${(bytes / 1024).toFixed(1)} KB`;
  return `${(bytes / (1024 * 1024)).toFixed(1)} MB`;
}

export function sizeIssue(bytes: number): TableIssue | null {
  if (bytes === 0) return issue(null, null, 'The file is empty.');
  if (bytes > MAX_DATASET_BYTES) {
    return issue(null, null, `The file is ${formatBytes(bytes)}; datasets may be at most ${formatBytes(MAX_DATASET_BYTES)}.`);
  }
  return null;
}

// ---- text or not -----------------------------------------------------------------------------

const signatures: { bytes: number[]; what: string }[] = [
  { bytes: [0x50, 0x4b, 0x03, 0x04], what: 'a ZIP archive (a spreadsheet workbook such as .xlsx is one): export the sheet as CSV first' },
  { bytes: [0xd0, 0xcf, 0x11, 0xe0], what: 'an old Office document (.xls): export the sheet as CSV first' },
  { bytes: [0x25, 0x50, 0x44, 0x46], what: 'a PDF document' },
  { bytes: [0x89, 0x50, 0x4e, 0x47], what: 'a PNG image' },
  { bytes: [0xff, 0xd8, 0xff], what: 'a JPEG image' },
  { bytes: [0x1f, 0x8b], what: 'a gzip archive: unpack it first' },
  { bytes: [0x89, 0x48, 0x44, 0x46], what: 'an HDF5 file' },
];

/**
 * The file's text, or why it is not text: known binary formats by their first bytes, NUL bytes,
 * or bytes that are not UTF-8. A leading byte-order mark is dropped.
 */
export function decodeText(bytes: Uint8Array): { text: string } | { issue: TableIssue } {
  for (const { bytes: sig, what } of signatures) {
    if (sig.every((b, i) => bytes[i] === b)) return { issue: issue(null, null, `This is not a text table: the content is ${what}.`) };
  }
  const nul = bytes.indexOf(0);
  if (nul >= 0) {
    return { issue: issue(lineAtByte(bytes, nul), null, `This is not a text file: it contains a NUL byte (at byte ${nul + 1}).`) };
  }
  try {
    const text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
    return { text: text.charCodeAt(0) === 0xfeff ? text.slice(1) : text };
  } catch {
    const at = firstInvalidUtf8(bytes);
    return {
      issue: issue(lineAtByte(bytes, at), null, `This is not UTF-8 text: byte ${at + 1} cannot be read. Save the file as UTF-8 text and try again.`),
    };
  }
}

function lineAtByte(bytes: Uint8Array, at: number): number {
  let line = 1;
  for (let i = 0; i < at; i++) if (bytes[i] === 0x0a) line++;
  return line;
}

function firstInvalidUtf8(bytes: Uint8Array): number {
  let i = 0;
  while (i < bytes.length) {
    const b = bytes[i]!;
    const need = b < 0x80 ? 0 : b >= 0xc2 && b < 0xe0 ? 1 : b >= 0xe0 && b < 0xf0 ? 2 : b >= 0xf0 && b < 0xf5 ? 3 : -1;
    if (need < 0) return i;
    for (let k = 1; k <= need; k++) if (i + k >= bytes.length || (bytes[i + k]! & 0xc0) !== 0x80) return i;
    i += need + 1;
  }
  return Math.max(0, bytes.length - 1);
}

// ---- which separator, by content ------------------------------------------------------------

/**
 * How well the first rows split under one separator: the header's width and the share of rows of
 * that width. A few ragged rows still count (they are reported on their lines later); one column does not.
 */
function splitUnder(sample: string, delimiter: string): { width: number; share: number } | null {
  const rows = Papa.parse<string[]>(sample, { delimiter, preview: 40, skipEmptyLines: 'greedy' }).data;
  if (rows.length === 0) return null;
  const width = rows[0]!.length;
  if (width < 2) return null;
  const share = rows.filter((r) => r.length === width).length / rows.length;
  return share >= 0.75 ? { width, share } : null;
}

function sampleOf(text: string): string {
  const sample = text.slice(0, 64 * 1024);
  return sample.length < text.length ? sample.slice(0, Math.max(sample.lastIndexOf('\n'), 0)) : sample;
}

/** The format the content shows (not the file name), or null when it shows neither. */
export function detectFormat(text: string): DatasetFormat | null {
  const sample = sampleOf(text);
  const comma = splitUnder(sample, ',');
  const tab = splitUnder(sample, '\t');
  if (tab && (!comma || tab.share > comma.share || (tab.share === comma.share && tab.width >= comma.width))) return 'tsv';
  return comma ? 'csv' : null;
}

/** Checks the declared format against the content; a problem when they differ or neither fits. */
export function formatIssue(text: string, declared: DatasetFormat): TableIssue | null {
  const detected = detectFormat(text);
  if (detected === declared) return null;
  if (detected === null) {
    // The declared separator may still give a consistent table when the other one would not.
    return splitUnder(sampleOf(text), delimiterOf[declared]) === null
      ? issue(
          null,
          null,
          `This does not read as ${formatWords[declared]}: the first lines do not split into the same number (at least two) of columns. ` +
            'A dataset needs a header line and rows with an x and a y column, separated by commas (CSV) or tabs (TSV).',
        )
      : null;
  }
  return issue(null, null, `The file was declared as ${formatWords[declared]}, but its content is ${formatWords[detected]}.`);
}

// ---- numbers ---------------------------------------------------------------------------------

// Decimal numbers with an optional exponent; Fortran's D exponent (1.5D-3) is read too.
const NUMBER = /^[+-]?(?:\d+\.?\d*|\.\d+)(?:[eEdD][+-]?\d+)?$/;

/** A cell as a finite number, or null when it is not one (empty, text, NaN, infinite, decimal comma). */
export function parseNumber(cell: string): number | null {
  const clean = cell.trim();
  if (!NUMBER.test(clean)) return null;
  const value = Number(clean.replace(/[dD]/, 'e'));
  return Number.isFinite(value) ? value : null;
}

function quoteCell(cell: string): string {
  const clean = cell.trim();
  return clean.length > 40 ? `“${clean.slice(0, 37)}…”` : `“${clean}”`;
}

// ---- the reader ------------------------------------------------------------------------------

export interface ReadOptions {
  format: DatasetFormat;
  /** Role of each column by position; x, y and sigma must be numbers. Omitted: only shape checks. */
  roles?: readonly ColumnRole[];
}

/**
 * Takes the rows papaparse hands over one at a time (in the browser from a streamed File, on the
 * server from the uploaded text) and builds the columns, counting lines itself so that every
 * problem names the line it is on, even when a quoted cell spans lines.
 */
export class TableReader {
  private line = 1;
  private newline = '\n';
  private header: string[] | null = null;
  private headerLine = 0;
  private columns: ParsedColumn[] = [];
  private lines: number[] = [];
  private previewRows: string[][] = [];
  private issues: TableIssue[] = [];
  private issueCount = 0;

  constructor(private readonly options: ReadOptions) {}

  private flag(found: TableIssue): void {
    this.issueCount++;
    if (this.issues.length < MAX_LISTED_ISSUES) this.issues.push(found);
  }

  /** The line break papaparse found ("\n", "\r\n" or "\r"), for counting lines inside quoted cells. */
  setLinebreak(linebreak: string | undefined): void {
    if (linebreak) this.newline = linebreak.includes('\n') ? '\n' : '\r';
  }

  /** One row, with papaparse's parse errors for it (e.g. an unclosed quote). */
  push(fields: string[], errors: readonly { code: string; message: string }[] = []): void {
    const line = this.line;
    let inner = 0;
    for (const field of fields) inner += countOf(field, this.newline);
    this.line += inner + 1;
    for (const e of errors) {
      this.flag(issue(line, null, e.code === 'MissingQuotes' ? 'A quoted cell is opened here and never closed.' : `${e.message}.`));
    }
    if (fields.every((f) => f.trim() === '')) return; // blank line

    if (this.header === null) {
      this.readHeader(fields, line);
      return;
    }
    const header = this.header;
    if (fields.length !== header.length) {
      this.flag(issue(line, null, `This row has ${fields.length} ${plural(fields.length, 'cell')}; the header has ${header.length}.`));
      return;
    }
    if (this.previewRows.length < PREVIEW_ROWS) this.previewRows.push(fields.map((f) => f.trim()));
    this.lines.push(line);
    const roles = this.options.roles;
    for (let c = 0; c < header.length; c++) {
      const cell = fields[c]!;
      const column = this.columns[c]!;
      const role = roles?.[c] ?? 'other';
      const value = parseNumber(cell);
      if (role === 'other') {
        if (value === null && cell.trim() !== '') column.numeric = false;
        column.values.push(value ?? (cell.trim() === '' ? null : cell.trim()));
        continue;
      }
      if (cell.trim() === '') {
        this.flag(issue(line, header[c]!, `The ${roleWords[role]} column “${header[c]}” has no value here.`));
      } else if (value === null) {
        this.flag(issue(line, header[c]!, `${quoteCell(cell)} is not a number, but “${header[c]}” is the ${roleWords[role]} column.`));
      } else if (role === 'sigma' && !(value > 0)) {
        this.flag(issue(line, header[c]!, `The error bar ${quoteCell(cell)} must be greater than zero.`));
      }
      column.values.push(value);
    }
  }

  private readHeader(fields: string[], line: number): void {
    const names = fields.map((f) => f.trim());
    this.header = names;
    this.headerLine = line;
    this.columns = names.map((header) => ({ header, numeric: true, values: [] }));
    if (names.length < 2) {
      this.flag(issue(line, null, 'The header names only one column; a dataset needs at least an x and a y column.'));
    }
    if (names.every((n) => parseNumber(n) !== null)) {
      this.flag(issue(line, null, 'The first line holds numbers, not column names: add a header line that names each column.'));
      return;
    }
    const seen = new Map<string, number>();
    names.forEach((name, i) => {
      if (name === '') this.flag(issue(line, null, `Column ${i + 1} has no name in the header.`));
      else if (seen.has(name.toLowerCase())) this.flag(issue(line, name, `Two columns are named “${name}” (columns ${seen.get(name.toLowerCase())! + 1} and ${i + 1}).`));
      else seen.set(name.toLowerCase(), i);
    });
    const roles = this.options.roles;
    if (roles && roles.length !== names.length) {
      this.flag(issue(line, null, `The column description lists ${roles.length} columns; the file has ${names.length}.`));
    }
  }

  finish(): TableRead {
    if (this.header === null) this.flag(issue(null, null, 'The file has no header line and no rows.'));
    else if (this.lines.length === 0 && this.issueCount === 0) this.flag(issue(null, null, 'The file has a header but no data rows.'));
    return {
      format: this.options.format,
      header: this.header ?? [],
      headerLine: this.headerLine,
      columns: this.columns,
      lines: this.lines,
      rowCount: this.lines.length,
      previewRows: this.previewRows,
      issues: this.issues,
      issueCount: this.issueCount,
    };
  }
}

const roleWords: Record<ColumnRole, string> = { x: 'x', y: 'y', sigma: 'error-bar', other: 'other' };

function countOf(text: string, needle: string): number {
  let count = 0;
  for (let i = text.indexOf(needle); i >= 0; i = text.indexOf(needle, i + 1)) count++;
  return count;
}

function plural(n: number, word: string): string {
  return n === 1 ? word : `${word}s`;
}

/** Reads a whole text at once (the server's path, and tests). */
export function readTable(text: string, options: ReadOptions): TableRead {
  const reader = new TableReader(options);
  Papa.parse<string[]>(text, {
    delimiter: delimiterOf[options.format],
    skipEmptyLines: false,
    step: (result) => {
      reader.setLinebreak(result.meta.linebreak);
      reader.push(result.data, result.errors);
    },
  });
  return reader.finish();
}

/** Every check on an uploaded file, in order: size, text, declared format, then the rows. */
export function readUpload(bytes: Uint8Array, options: ReadOptions): { table: TableRead } | { issues: TableIssue[]; issueCount: number } {
  const tooBig = sizeIssue(bytes.byteLength);
  if (tooBig) return { issues: [tooBig], issueCount: 1 };
  const decoded = decodeText(bytes);
  if ('issue' in decoded) return { issues: [decoded.issue], issueCount: 1 };
  const wrongFormat = formatIssue(decoded.text, options.format);
  if (wrongFormat) return { issues: [wrongFormat], issueCount: 1 };
  const table = readTable(decoded.text, options);
  if (table.issueCount > 0) return { issues: table.issues, issueCount: table.issueCount };
  return { table };
}

/** The dataset as CSV again (header line, then the rows), for download. */
export function toCsv(columns: readonly { header: string; values: readonly (number | string | null)[] }[]): string {
  const rows = columns[0]?.values.length ?? 0;
  const data: (string | number)[][] = [];
  for (let r = 0; r < rows; r++) data.push(columns.map((c) => c.values[r] ?? ''));
  return Papa.unparse({ fields: columns.map((c) => c.header), data }, { newline: '\n' }) + '\n';
}
