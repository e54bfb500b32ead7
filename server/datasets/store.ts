// Datasets of a group: storing an upload (the file and its parsed columns in one transaction, after
// every check passed), the list, one dataset's description, its numbers for plots and fits, and
// the CSV download. Every read is scoped by group id: a dataset of another group is simply not found.
import { createHash } from 'node:crypto';
import { and, asc, desc, eq, inArray, sql } from 'drizzle-orm';
import { getDb, schema } from '../../db/client';
import type { ColumnRole, DatasetFormat } from '../../db/schema';
import { conflict, notFound } from '../api/errors';
import type { DatasetMeta } from './input';
import { readUpload, toCsv, type TableIssue } from './table';

export interface ColumnView {
  position: number;
  header: string;
  role: ColumnRole;
  quantity: string;
  unit: string;
  numeric: boolean;
}

export interface DatasetSummary {
  id: string;
  name: string;
  description: string;
  fileName: string;
  format: DatasetFormat;
  fileBytes: number;
  rowCount: number;
  uploadedBy: string | null;
  uploadedAt: Date;
  x: { quantity: string; unit: string; header: string } | null;
  y: { quantity: string; unit: string; header: string } | null;
  hasErrorBars: boolean;
}

export interface DatasetDetail extends DatasetSummary {
  columns: ColumnView[];
  fileSha256: string;
  /** The first rows, as text, in column order. */
  previewRows: (number | string | null)[][];
}

export interface SeriesAxis {
  header: string;
  quantity: string;
  unit: string;
  values: number[];
}

/** What a plot or a fit needs: x, y and (when uploaded) the error bars of y, row by row. */
export interface DatasetSeries {
  id: string;
  name: string;
  x: SeriesAxis;
  y: SeriesAxis;
  sigma: SeriesAxis | null;
}

export type UploadOutcome =
  | { ok: true; dataset: DatasetSummary }
  | { ok: false; error: string; field: string; issues: TableIssue[]; issueCount: number };

const PREVIEW = 20;

async function ensureNameFree(groupId: string, name: string): Promise<void> {
  const [clash] = await getDb()
    .select({ id: schema.datasets.id })
    .from(schema.datasets)
    .where(and(eq(schema.datasets.groupId, groupId), sql`lower(${schema.datasets.name}) = lower(${name})`));
  if (clash) throw conflict('A dataset with this name already exists in the group.', 'name');
}

/** Checks the file against its description; stores it only if every check passes. */
export async function createDataset(
  groupId: string,
  userId: string,
  meta: DatasetMeta,
  file: { name: string; bytes: Uint8Array },
): Promise<UploadOutcome> {
  await ensureNameFree(groupId, meta.name);
  const read = readUpload(file.bytes, { format: meta.format, roles: meta.columns.map((c) => c.role) });
  if ('issues' in read) {
    const first = read.issues[0]!;
    const where = first.line ? `Line ${first.line}: ` : '';
    const more = read.issueCount > 1 ? ` (${read.issueCount} problems in all; the first ${read.issues.length} are listed)` : '';
    return { ok: false, error: `${where}${first.message}${more}`, field: 'file', issues: read.issues, issueCount: read.issueCount };
  }
  const { table } = read;
  const fileText = new TextDecoder().decode(file.bytes);
  const id = await getDb().transaction(async (tx) => {
    const [row] = await tx
      .insert(schema.datasets)
      .values({
        groupId,
        name: meta.name,
        description: meta.description,
        fileName: file.name.slice(0, 255) || 'upload',
        format: meta.format,
        fileText,
        fileBytes: file.bytes.byteLength,
        fileSha256: createHash('sha256').update(file.bytes).digest('hex'),
        rowCount: table.rowCount,
        uploadedBy: userId,
      })
      .returning({ id: schema.datasets.id });
    await tx.insert(schema.datasetColumns).values(
      table.columns.map((column, position) => ({
        datasetId: row!.id,
        position,
        header: column.header,
        role: meta.columns[position]!.role,
        quantity: meta.columns[position]!.quantity,
        unit: meta.columns[position]!.unit,
        numeric: column.numeric,
        values: column.values,
      })),
    );
    return row!.id;
  });
  return { ok: true, dataset: await datasetSummary(groupId, id) };
}

const summaryFields = {
  id: schema.datasets.id,
  name: schema.datasets.name,
  description: schema.datasets.description,
  fileName: schema.datasets.fileName,
  format: schema.datasets.format,
  fileBytes: schema.datasets.fileBytes,
  rowCount: schema.datasets.rowCount,
  uploadedBy: schema.users.name,
  uploadedAt: schema.datasets.uploadedAt,
};

type SummaryRow = Omit<DatasetSummary, 'x' | 'y' | 'hasErrorBars'>;

async function columnsOf(datasetIds: string[]): Promise<(ColumnView & { datasetId: string })[]> {
  if (datasetIds.length === 0) return [];
  return getDb()
    .select({
      datasetId: schema.datasetColumns.datasetId,
      position: schema.datasetColumns.position,
      header: schema.datasetColumns.header,
      role: schema.datasetColumns.role,
      quantity: schema.datasetColumns.quantity,
      unit: schema.datasetColumns.unit,
      numeric: schema.datasetColumns.numeric,
    })
    .from(schema.datasetColumns)
    .where(inArray(schema.datasetColumns.datasetId, datasetIds))
    .orderBy(asc(schema.datasetColumns.position));
}

function withAxes(row: SummaryRow, columns: ColumnView[]): DatasetSummary {
  const axis = (role: ColumnRole) => {
    const c = columns.find((col) => col.role === role);
    return c ? { quantity: c.quantity, unit: c.unit, header: c.header } : null;
  };
  return { ...row, x: axis('x'), y: axis('y'), hasErrorBars: columns.some((c) => c.role === 'sigma') };
}

export async function listDatasets(groupId: string): Promise<DatasetSummary[]> {
  const rows = await getDb()
    .select(summaryFields)
    .from(schema.datasets)
    .leftJoin(schema.users, eq(schema.users.id, schema.datasets.uploadedBy))
    .where(eq(schema.datasets.groupId, groupId))
    .orderBy(desc(schema.datasets.uploadedAt));
  const columns = await columnsOf(rows.map((r) => r.id));
  return rows.map((row) => withAxes(row, columns.filter((c) => c.datasetId === row.id)));
}

async function summaryRow(groupId: string, datasetId: string): Promise<SummaryRow & { fileSha256: string }> {
  const [row] = await getDb()
    .select({ ...summaryFields, fileSha256: schema.datasets.fileSha256 })
    .from(schema.datasets)
    .leftJoin(schema.users, eq(schema.users.id, schema.datasets.uploadedBy))
    .where(and(eq(schema.datasets.id, datasetId), eq(schema.datasets.groupId, groupId)));
  if (!row) throw notFound('No such dataset in this group.');
  return row;
}

export async function datasetSummary(groupId: string, datasetId: string): Promise<DatasetSummary> {
  const { fileSha256: _hash, ...row } = await summaryRow(groupId, datasetId);
  return withAxes(row, await columnsOf([datasetId]));
}

export async function datasetDetail(groupId: string, datasetId: string): Promise<DatasetDetail> {
  const row = await summaryRow(groupId, datasetId);
  const columns = await getDb()
    .select({
      position: schema.datasetColumns.position,
      header: schema.datasetColumns.header,
      role: schema.datasetColumns.role,
      quantity: schema.datasetColumns.quantity,
      unit: schema.datasetColumns.unit,
      numeric: schema.datasetColumns.numeric,
      preview: sql<(number | string | null)[]>`coalesce((
        select jsonb_agg(v.value order by v.ordinality) from jsonb_array_elements(${schema.datasetColumns.values}) with ordinality v
        where v.ordinality <= ${PREVIEW}
      ), '[]'::jsonb)`,
    })
    .from(schema.datasetColumns)
    .where(eq(schema.datasetColumns.datasetId, datasetId))
    .orderBy(asc(schema.datasetColumns.position));
  const rows = Math.min(PREVIEW, row.rowCount);
  const previewRows: (number | string | null)[][] = [];
  for (let r = 0; r < rows; r++) previewRows.push(columns.map((c) => c.preview[r] ?? null));
  const views = columns.map(({ preview: _preview, ...c }) => c);
  return { ...withAxes(row, views), columns: views, fileSha256: row.fileSha256, previewRows };
}

async function fullColumns(groupId: string, datasetId: string) {
  const [owner] = await getDb()
    .select({ name: schema.datasets.name })
    .from(schema.datasets)
    .where(and(eq(schema.datasets.id, datasetId), eq(schema.datasets.groupId, groupId)));
  if (!owner) throw notFound('No such dataset in this group.');
  const columns = await getDb()
    .select({
      header: schema.datasetColumns.header,
      role: schema.datasetColumns.role,
      quantity: schema.datasetColumns.quantity,
      unit: schema.datasetColumns.unit,
      values: schema.datasetColumns.values,
    })
    .from(schema.datasetColumns)
    .where(eq(schema.datasetColumns.datasetId, datasetId))
    .orderBy(asc(schema.datasetColumns.position));
  return { name: owner.name, columns };
}

export async function datasetSeries(groupId: string, datasetId: string): Promise<DatasetSeries> {
  const { name, columns } = await fullColumns(groupId, datasetId);
  const axis = (role: ColumnRole): SeriesAxis | null => {
    const c = columns.find((col) => col.role === role);
    return c ? { header: c.header, quantity: c.quantity, unit: c.unit, values: c.values as number[] } : null;
  };
  const x = axis('x');
  const y = axis('y');
  if (!x || !y) throw notFound('This dataset has no x and y columns.');
  return { id: datasetId, name, x, y, sigma: axis('sigma') };
}

export interface DownloadFile {
  fileName: string;
  contentType: string;
  text: string;
}

/** The parsed columns written out as CSV (whatever the uploaded format), or the file as uploaded. */
export async function datasetDownload(groupId: string, datasetId: string, original: boolean): Promise<DownloadFile> {
  if (original) {
    const [row] = await getDb()
      .select({ fileName: schema.datasets.fileName, format: schema.datasets.format, text: schema.datasets.fileText })
      .from(schema.datasets)
      .where(and(eq(schema.datasets.id, datasetId), eq(schema.datasets.groupId, groupId)));
    if (!row) throw notFound('No such dataset in this group.');
    return { fileName: row.fileName, contentType: row.format === 'tsv' ? 'text/tab-separated-values' : 'text/csv', text: row.text };
  }
  const { name, columns } = await fullColumns(groupId, datasetId);
  return { fileName: `${safeFileName(name)}.csv`, contentType: 'text/csv', text: toCsv(columns) };
}

function safeFileName(name: string): string {
  return name.replace(/[^\p{L}\p{N}._ -]+/gu, '_').replace(/\s+/g, '-').slice(0, 100) || 'dataset';
}
