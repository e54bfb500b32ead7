// Datasets through the real routes of a running server: upload (CSV and TSV), the list, a
// dataset's description and numbers, the CSV download, every refused file with its line numbers,
// the size limit, the role rules (DESIGN.md roles table) and the wall between groups.
import Papa from 'papaparse';
import { demoDatasetName } from '../../db/demoDataset';
import { agreesWithExponent } from '../../flow/fit';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import {
  api,
  demoAccount,
  demoSessions,
  registerAndSignIn,
  startServer,
  type Api,
  type DemoSessions,
  type StartedServer,
} from '../helpers';

interface Issue {
  line: number | null;
  column: string | null;
  message: string;
}
interface Refusal {
  error: string;
  field?: string;
  issues?: Issue[];
  issueCount?: number;
}
interface Summary {
  id: string;
  name: string;
  description: string;
  fileName: string;
  format: 'csv' | 'tsv';
  rowCount: number;
  uploadedBy: string | null;
  uploadedAt: string;
  x: { quantity: string; unit: string; header: string } | null;
  y: { quantity: string; unit: string; header: string } | null;
  hasErrorBars: boolean;
}
interface Detail extends Summary {
  columns: { header: string; role: string; quantity: string; unit: string; numeric: boolean }[];
  previewRows: (number | string | null)[][];
  fileSha256: string;
}
interface Series {
  x: { values: number[]; quantity: string };
  y: { values: number[] };
  sigma: { values: number[] } | null;
}

let server: StartedServer;
let demo: DemoSessions;
let outsiderCookie: string;
let outsiderGroupId: string;

const walkColumns = [
  { role: 'x', quantity: 'walk length T', unit: 'steps' },
  { role: 'y', quantity: 'mean-square end-to-end distance', unit: 'lattice spacings²' },
  { role: 'sigma', quantity: 'standard error', unit: 'lattice spacings²' },
];
const walkCsv = 'T,R2,err\n16,21.9,0.4\n32,46.8,0.7\n64,99.1,1.2\n128,209.5,2.5\n256,437.0,5.1\n';

interface UploadOptions {
  name?: string;
  format?: 'csv' | 'tsv';
  columns?: unknown[];
  fileName?: string;
  description?: string;
  cookie?: string;
  groupId?: string;
  meta?: unknown;
}

async function upload(content: string | Uint8Array<ArrayBuffer>, options: UploadOptions = {}) {
  const form = new FormData();
  const meta = options.meta ?? {
    name: options.name ?? `Walk sizes ${Math.random().toString(36).slice(2, 8)}`,
    description: options.description ?? 'Invented numbers for the test.',
    format: options.format ?? 'csv',
    columns: options.columns ?? walkColumns,
  };
  form.set('meta', JSON.stringify(meta));
  form.set('file', new Blob([content]), options.fileName ?? 'walks.csv');
  const response = await fetch(`${server.url}/api/groups/${options.groupId ?? demo.groupId}/datasets`, {
    method: 'POST',
    headers: options.cookie === '' ? {} : { cookie: options.cookie ?? demo.cookies.author },
    body: form,
  });
  return { status: response.status, body: (await response.json()) as Summary & Refusal };
}

const listOf = async (who: Api, groupId = demo.groupId) =>
  (await who.get<{ datasets: Summary[] }>(`/api/groups/${groupId}/datasets`)).body.datasets;

beforeAll(async () => {
  server = await startServer({ demo: true });
  demo = await demoSessions(server.url);
  outsiderCookie = await registerAndSignIn(server.url, {
    name: 'Outside Person',
    email: 'outside-data@elsewhere.example',
    password: 'outside-password-1',
  });
  const group = await api(server.url, outsiderCookie).post<{ id: string }>('/api/groups', { name: 'Another Group' });
  outsiderGroupId = group.body.id;
});

afterAll(async () => {
  await server?.stop();
});

describe('uploading a dataset', () => {
  test('an author uploads a CSV with error bars; it is listed with who uploaded it and when, and its numbers come back', async () => {
    const before = Date.now();
    const created = await upload(walkCsv, { name: 'Walk sizes, d = 4', fileName: 'walks.csv' });
    expect(created.status).toBe(201);
    expect(created.body.rowCount).toBe(5);

    const rows = await listOf(demo.as.reader);
    const row = rows.find((r) => r.id === created.body.id)!;
    expect(row.name).toBe('Walk sizes, d = 4');
    expect(row.uploadedBy).toBe(demoAccount('author').name);
    expect(Date.parse(row.uploadedAt)).toBeGreaterThanOrEqual(before - 5_000);
    expect(row.x).toEqual({ quantity: 'walk length T', unit: 'steps', header: 'T' });
    expect(row.y?.quantity).toBe('mean-square end-to-end distance');
    expect(row.hasErrorBars).toBe(true);

    const detail = await demo.as.reader.get<Detail>(`/api/groups/${demo.groupId}/datasets/${created.body.id}`);
    expect(detail.status).toBe(200);
    expect(detail.body.columns.map((c) => [c.header, c.role])).toEqual([
      ['T', 'x'],
      ['R2', 'y'],
      ['err', 'sigma'],
    ]);
    expect(detail.body.previewRows[0]).toEqual([16, 21.9, 0.4]);
    expect(detail.body.fileSha256).toMatch(/^[0-9a-f]{64}$/);

    const series = await demo.as.reader.get<Series>(`/api/groups/${demo.groupId}/datasets/${created.body.id}/columns`);
    expect(series.body.x.values).toEqual([16, 32, 64, 128, 256]);
    expect(series.body.y.values).toEqual([21.9, 46.8, 99.1, 209.5, 437.0]);
    expect(series.body.sigma?.values).toEqual([0.4, 0.7, 1.2, 2.5, 5.1]);
  });

  test('the dataset downloads back as CSV with the same header and numbers, and the original file byte for byte', async () => {
    const created = await upload(walkCsv, { name: 'Walk sizes for download' });
    const response = await fetch(`${server.url}/api/groups/${demo.groupId}/datasets/${created.body.id}/download`, {
      headers: { cookie: demo.cookies.reader },
    });
    expect(response.status).toBe(200);
    expect(response.headers.get('content-type')).toMatch(/^text\/csv/);
    expect(response.headers.get('content-disposition')).toMatch(/attachment; filename="Walk-sizes-for-download\.csv"/);
    const back = Papa.parse<string[]>((await response.text()).trim()).data;
    const sent = Papa.parse<string[]>(walkCsv.trim()).data;
    expect(back[0]).toEqual(sent[0]);
    expect(back.slice(1).map((r) => r.map(Number))).toEqual(sent.slice(1).map((r) => r.map(Number)));

    const original = await fetch(`${server.url}/api/groups/${demo.groupId}/datasets/${created.body.id}/download?original=1`, {
      headers: { cookie: demo.cookies.reader },
    });
    expect(await original.text()).toBe(walkCsv);
  });

  test('a TSV upload is read by its tabs and downloads as CSV', async () => {
    const tsv = 't\tchi\n0.1\t12.5\n0.05\t27.1\n0.02\t74.0\n';
    const created = await upload(tsv, {
      name: 'Susceptibility',
      format: 'tsv',
      fileName: 'chi.tsv',
      columns: [
        { role: 'x', quantity: 'reduced temperature t', unit: '' },
        { role: 'y', quantity: 'susceptibility', unit: '' },
      ],
    });
    expect(created.status).toBe(201);
    expect(created.body.format).toBe('tsv');
    const response = await fetch(`${server.url}/api/groups/${demo.groupId}/datasets/${created.body.id}/download`, {
      headers: { cookie: demo.cookies.lead },
    });
    expect(await response.text()).toBe('t,chi\n0.1,12.5\n0.05,27.1\n0.02,74\n');
  });

  test('the file is judged by its content, not its name: a CSV called .txt is accepted, a PNG called .csv is refused', async () => {
    const accepted = await upload(walkCsv, { fileName: 'numbers.txt' });
    expect(accepted.status).toBe(201);
    const png = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13, 73, 72, 68, 82]);
    const refused = await upload(png, { fileName: 'walks.csv' });
    expect(refused.status).toBe(400);
    expect(refused.body.field).toBe('file');
    expect(refused.body.error).toMatch(/not a text table.*PNG image/);
  });

  test('cells that are not numbers in the x, y or error-bar column are refused, with their line numbers', async () => {
    const before = await listOf(demo.as.lead);
    const csv = 'T,R2,err\n16,21.9,0.4\n32,about 47,0.7\n64,99.1,1.2\n128,,2.5\n256,437.0,-1\n';
    const refused = await upload(csv);
    expect(refused.status).toBe(400);
    expect(refused.body.issueCount).toBe(3);
    expect(refused.body.issues!.map((i) => [i.line, i.column])).toEqual([
      [3, 'R2'],
      [5, 'R2'],
      [6, 'err'],
    ]);
    expect(refused.body.issues![0]!.message).toMatch(/“about 47” is not a number/);
    expect(refused.body.issues![1]!.message).toMatch(/has no value/);
    expect(refused.body.issues![2]!.message).toMatch(/greater than zero/);
    expect(refused.body.error).toMatch(/^Line 3: /);
    expect(await listOf(demo.as.lead)).toEqual(before);
  });

  test('a ragged row is refused with its line, counted past blank lines and a quoted cell that spans two lines', async () => {
    const csv = 'T,R2,label\n16,21.9,"first\nrun"\n\n32,46.8\n64,99.1,third\n';
    const refused = await upload(csv, {
      columns: [
        { role: 'x', quantity: 'walk length T', unit: '' },
        { role: 'y', quantity: 'size', unit: '' },
        { role: 'other', quantity: 'run label', unit: '' },
      ],
    });
    expect(refused.status).toBe(400);
    expect(refused.body.issues).toEqual([{ line: 5, column: null, message: 'This row has 2 cells; the header has 3.' }]);
  });

  test('a file without a header line is refused on line 1', async () => {
    const refused = await upload('16,21.9,0.4\n32,46.8,0.7\n');
    expect(refused.status).toBe(400);
    expect(refused.body.issues![0]).toMatchObject({ line: 1 });
    expect(refused.body.error).toMatch(/first line holds numbers, not column names/);
  });

  test('a file declared as CSV whose content is tab-separated is refused, and so is text that is no table', async () => {
    const wrong = await upload('T\tR2\n16\t21.9\n', { format: 'csv', columns: walkColumns.slice(0, 2) });
    expect(wrong.status).toBe(400);
    expect(wrong.body.error).toMatch(/declared as CSV.*content is TSV/);
    const prose = await upload('Dear colleague,\nplease find the numbers attached.\n', { columns: walkColumns.slice(0, 2) });
    expect(prose.status).toBe(400);
    expect(prose.body.error).toMatch(/does not read as CSV/);
  });

  test('a file over 20 MB is refused with 413 and nothing is stored', async () => {
    const before = await listOf(demo.as.lead);
    const row = '1024,3.14159265358979,0.001\n';
    const big = 'T,R2,err\n' + row.repeat(Math.ceil((20 * 1024 * 1024) / row.length) + 10);
    const refused = await upload(big);
    expect(refused.status).toBe(413);
    expect(refused.body.error).toMatch(/over the limit of 20\.0 MB|larger than the limit of 20\.0 MB/);
    expect(await listOf(demo.as.lead)).toEqual(before);
  });

  test('a description without an x column, or with a name already used in the group, is refused on its field', async () => {
    const noX = await upload(walkCsv, {
      columns: [
        { role: 'other', quantity: '', unit: '' },
        { role: 'y', quantity: 'size', unit: '' },
        { role: 'sigma', quantity: '', unit: '' },
      ],
    });
    expect(noX.status).toBe(400);
    expect(noX.body).toMatchObject({ field: 'columns', error: 'Choose the column that holds x.' });
    const first = await upload(walkCsv, { name: 'Only once' });
    expect(first.status).toBe(201);
    const again = await upload(walkCsv, { name: 'ONLY ONCE' });
    expect(again.status).toBe(409);
    expect(again.body.field).toBe('name');
    const wrongCount = await upload(walkCsv, { columns: walkColumns.slice(0, 2) });
    expect(wrongCount.status).toBe(400);
    expect(wrongCount.body.error).toMatch(/lists 2 columns; the file has 3/);
  });
});

describe('the demo group’s dataset', () => {
  test('the demo comes with an invented dataset whose numbers agree with the (ln T)^(1/4) correction they were made with', async () => {
    const row = (await listOf(demo.as.reader)).find((d) => d.name === demoDatasetName)!;
    expect(row).toMatchObject({ rowCount: 16, hasErrorBars: true, uploadedBy: demoAccount('author').name });
    const series = await demo.as.reader.get<Series>(`/api/groups/${demo.groupId}/datasets/${row.id}/columns`);
    const data = { x: series.body.x.values, y: series.body.y.values, sigma: series.body.sigma!.values };
    expect(agreesWithExponent(data, 'p', 0.25, { other: 1 }).verdict).toBe('agrees');
    expect(agreesWithExponent(data, 'p', 0, { other: 1 }).verdict).toBe('disagrees');
  });
});

describe('who may upload and who may see', () => {
  test('a reviewer and a reader are refused with 403, a visitor without a session with 401, and nothing is stored', async () => {
    const before = await listOf(demo.as.lead);
    for (const role of ['reviewer', 'reader'] as const) {
      const refused = await upload(walkCsv, { cookie: demo.cookies[role] });
      expect(refused.status).toBe(403);
      expect(refused.body.error).toMatch(/may not upload datasets/);
    }
    expect((await upload(walkCsv, { cookie: '' })).status).toBe(401);
    const lead = await upload(walkCsv, { cookie: demo.cookies.lead, name: 'Uploaded by the lead' });
    expect(lead.status).toBe(201);
    expect((await listOf(demo.as.lead)).length).toBe(before.length + 1);
  });

  test('a dataset of one group is never visible to another group, whichever ids are combined', async () => {
    const outsider = api(server.url, outsiderCookie);
    const mine = await upload(walkCsv, { name: 'Group secret' });
    const theirs = await upload(walkCsv, { cookie: outsiderCookie, groupId: outsiderGroupId, name: 'Their own' });
    expect(theirs.status).toBe(201);

    // An outsider asking through the demo group is not a member there.
    for (const path of ['', `/${mine.body.id}`, `/${mine.body.id}/columns`, `/${mine.body.id}/download`]) {
      expect((await outsider.get(`/api/groups/${demo.groupId}/datasets${path}`)).status).toBe(403);
    }
    // Through their own group, the demo group's dataset id is simply not found.
    for (const path of [`/${mine.body.id}`, `/${mine.body.id}/columns`, `/${mine.body.id}/download`]) {
      expect((await outsider.get(`/api/groups/${outsiderGroupId}/datasets${path}`)).status).toBe(404);
    }
    // Through a derivation: only the datasets of that derivation's group.
    const outsiderDerivation = await outsider.post<{ id: string }>(`/api/groups/${outsiderGroupId}/derivations`, { title: 'Their notes' });
    expect((await outsider.get(`/api/derivations/${outsiderDerivation.body.id}/datasets/${mine.body.id}/columns`)).status).toBe(404);
    expect((await outsider.get(`/api/derivations/${demo.derivationId}/datasets/${mine.body.id}/columns`)).status).toBe(403);
    const viaDerivation = await demo.as.reader.get<{ groupId: string; datasets: Summary[] }>(`/api/derivations/${demo.derivationId}/datasets`);
    expect(viaDerivation.body.groupId).toBe(demo.groupId);
    expect(viaDerivation.body.datasets.map((d) => d.id)).toContain(mine.body.id);
    expect(viaDerivation.body.datasets.map((d) => d.id)).not.toContain(theirs.body.id);
    const columns = await demo.as.reader.get<Series>(`/api/derivations/${demo.derivationId}/datasets/${mine.body.id}/columns`);
    expect(columns.body.x.values).toEqual([16, 32, 64, 128, 256]);
    // And the other way round.
    expect((await demo.as.lead.get(`/api/groups/${demo.groupId}/datasets/${theirs.body.id}`)).status).toBe(404);
    expect((await listOf(demo.as.lead)).map((d) => d.id)).not.toContain(theirs.body.id);
    expect((await listOf(outsider, outsiderGroupId)).map((d) => d.name)).toEqual(['Their own']);
  });
});
