'use client';
// Uploading a dataset: choose a file, see its first rows, say what each column means, then the
// whole file is read in the browser (streamed by papaparse, with progress) with the same checks the
// server runs, and only a clean file is sent. The server checks it again before storing anything.
import { zodResolver } from '@hookform/resolvers/zod';
import Link from 'next/link';
import { useRouter } from 'next/navigation';
import Papa from 'papaparse';
import { useEffect, useId, useState } from 'react';
import { useFieldArray, useForm } from 'react-hook-form';
import { IssueList, type FileIssue } from '@/components/datasets/IssueList';
import { Button, FieldShell, Notice, SelectField, TextField } from '@/components/ui';
import type { DatasetSummary } from '@/server/datasets/store';
import { datasetMetaSchema, type DatasetMetaInput } from '@/server/datasets/input';
import {
  decodeText,
  delimiterOf,
  detectFormat,
  formatBytes,
  formatWords,
  readTable,
  sizeIssue,
  TableReader,
  type ColumnRole,
  type DatasetFormat,
  type TableRead,
} from '@/server/datasets/table';
import type { Wire } from '../../../../_lib/wire';
import { GroupHeader } from '../../GroupHeader';
import { useGroup } from '../../useGroup';

const HEAD_BYTES = 64 * 1024;

const roleOptions: { value: ColumnRole; label: string }[] = [
  { value: 'x', label: 'x (abscissa)' },
  { value: 'y', label: 'y (ordinate)' },
  { value: 'sigma', label: 'error bar of y (one standard deviation)' },
  { value: 'other', label: 'other (kept, not plotted)' },
];

interface Chosen {
  file: File;
  detected: DatasetFormat | null;
  head: string;
  complete: boolean;
}

/** The first bytes of the file as text, cut at a line end so that no character is split. */
async function readHead(file: File): Promise<{ text: string } | { issue: FileIssue }> {
  let bytes = new Uint8Array(await file.slice(0, HEAD_BYTES).arrayBuffer());
  if (file.size > HEAD_BYTES) {
    const lastNewline = bytes.lastIndexOf(0x0a);
    if (lastNewline > 0) bytes = bytes.slice(0, lastNewline + 1);
  }
  return decodeText(bytes);
}

/** Roles guessed from the content: the first two numeric columns are x and y; an error column is one named like it (err, sigma, dchi for chi). */
function guessRoles(preview: TableRead): ColumnRole[] {
  const roles: ColumnRole[] = preview.header.map(() => 'other');
  const numeric = preview.columns.map((c, i) => (c.numeric && c.values.length > 0 ? i : -1)).filter((i) => i >= 0);
  const errorNamed = (i: number) => /err|sigma|\bsd\b|std|unc|δ|delta/i.test(preview.header[i]!);
  const plain = numeric.filter((i) => !errorNamed(i));
  const [x, y] = plain;
  if (x === undefined || y === undefined) return roles;
  roles[x] = 'x';
  roles[y] = 'y';
  const yName = preview.header[y]!.toLowerCase();
  const errorOfY = (i: number) => {
    const name = preview.header[i]!.toLowerCase();
    return errorNamed(i) || name === `d${yName}` || name === `${yName}_err` || name === `${yName}err` || name === `s${yName}`;
  };
  const sigma = numeric.find((i) => i !== x && i !== y && errorOfY(i));
  if (sigma !== undefined) roles[sigma] = 'sigma';
  return roles;
}

function nameFrom(fileName: string): string {
  return fileName.replace(/\.[^.]+$/, '').replace(/[_-]+/g, ' ').trim().slice(0, 120);
}

/** Streams the whole file through the same reader the server uses; reports progress in [0, 1]. */
function checkWholeFile(file: File, format: DatasetFormat, roles: ColumnRole[], onProgress: (share: number) => void): Promise<TableRead> {
  return new Promise((resolve, reject) => {
    const reader = new TableReader({ format, roles });
    let shown = 0;
    Papa.parse<string[]>(file, {
      delimiter: delimiterOf[format],
      skipEmptyLines: false,
      chunkSize: 512 * 1024,
      step: (result) => {
        reader.setLinebreak(result.meta.linebreak);
        reader.push(result.data, result.errors);
        const share = Math.min(1, result.meta.cursor / Math.max(1, file.size));
        if (share - shown >= 0.01) {
          shown = share;
          onProgress(share);
        }
      },
      complete: () => {
        onProgress(1);
        resolve(reader.finish());
      },
      error: (error) => reject(error),
    });
  });
}

interface UploadAnswer {
  status: number;
  body: (Wire<DatasetSummary> & { error?: string; field?: string; issues?: FileIssue[]; issueCount?: number }) | null;
}

/** XMLHttpRequest rather than fetch: it reports upload progress. */
function send(url: string, form: FormData, onProgress: (share: number) => void): Promise<UploadAnswer> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest();
    xhr.open('POST', url);
    xhr.responseType = 'text';
    xhr.upload.onprogress = (event) => {
      if (event.lengthComputable) onProgress(event.loaded / event.total);
    };
    xhr.onload = () => {
      let body: UploadAnswer['body'] = null;
      try {
        body = JSON.parse(xhr.responseText) as UploadAnswer['body'];
      } catch {
        body = null;
      }
      resolve({ status: xhr.status, body });
    };
    xhr.onerror = () => reject(new Error('The upload did not reach the server. Check the connection and try again.'));
    xhr.send(form);
  });
}

type Phase = { kind: 'idle' } | { kind: 'checking'; share: number } | { kind: 'uploading'; share: number };

export function UploadPage({ groupId }: { groupId: string }) {
  const group = useGroup(groupId);
  const router = useRouter();
  const fileId = useId();
  const [chosen, setChosen] = useState<Chosen | null>(null);
  const [fileProblem, setFileProblem] = useState<FileIssue | null>(null);
  const [preview, setPreview] = useState<TableRead | null>(null);
  const [issues, setIssues] = useState<{ list: FileIssue[]; total: number; title: string } | null>(null);
  const [phase, setPhase] = useState<Phase>({ kind: 'idle' });
  const [serverError, setServerError] = useState<string | null>(null);

  const form = useForm<DatasetMetaInput>({
    resolver: zodResolver(datasetMetaSchema),
    defaultValues: { name: '', description: '', format: 'csv', columns: [] },
  });
  const columns = useFieldArray({ control: form.control, name: 'columns' });
  const format = form.watch('format');
  const { errors } = form.formState;

  // Re-read the preview whenever the file or its declared format changes.
  useEffect(() => {
    if (!chosen) return;
    const table = readTable(chosen.head, { format });
    setPreview(table);
    const roles = guessRoles(table);
    columns.replace(table.header.map((_, i) => ({ role: roles[i]!, quantity: '', unit: '' })));
    // eslint-disable-next-line react-hooks/exhaustive-deps -- columns.replace is stable
  }, [chosen, format]);

  async function choose(file: File | undefined) {
    setChosen(null);
    setPreview(null);
    setIssues(null);
    setServerError(null);
    setFileProblem(null);
    if (!file) return;
    const tooBig = sizeIssue(file.size);
    if (tooBig) return setFileProblem(tooBig);
    const head = await readHead(file);
    if ('issue' in head) return setFileProblem(head.issue);
    const detected = detectFormat(head.text);
    form.setValue('format', detected ?? (/\.tsv$|\.tab$/i.test(file.name) ? 'tsv' : 'csv'));
    if (!form.getValues('name')) form.setValue('name', nameFrom(file.name));
    setChosen({ file, detected, head: head.text, complete: file.size <= HEAD_BYTES });
  }

  async function submit(values: DatasetMetaInput) {
    if (!chosen) return;
    setIssues(null);
    setServerError(null);
    const roles = values.columns.map((c) => c.role);
    setPhase({ kind: 'checking', share: 0 });
    const table = await checkWholeFile(chosen.file, values.format, roles, (share) => setPhase({ kind: 'checking', share }));
    if (table.issueCount > 0) {
      setPhase({ kind: 'idle' });
      setIssues({ list: table.issues, total: table.issueCount, title: 'The file has problems to fix first.' });
      return;
    }
    const body = new FormData();
    body.set('meta', JSON.stringify(values));
    body.set('file', chosen.file, chosen.file.name);
    setPhase({ kind: 'uploading', share: 0 });
    try {
      const answer = await send(`/api/groups/${groupId}/datasets`, body, (share) => setPhase({ kind: 'uploading', share }));
      if (answer.status === 201 && answer.body) {
        router.push(`/groups/${groupId}/datasets/${answer.body.id}`);
        return;
      }
      setPhase({ kind: 'idle' });
      const message = answer.body?.error ?? `The server answered ${answer.status}.`;
      if (answer.body?.issues?.length) {
        setIssues({ list: answer.body.issues, total: answer.body.issueCount ?? answer.body.issues.length, title: 'The server refused the file.' });
      } else if (answer.body?.field === 'name') {
        form.setError('name', { message });
      } else {
        setServerError(message);
      }
    } catch (error) {
      setPhase({ kind: 'idle' });
      setServerError(error instanceof Error ? error.message : 'The upload failed.');
    }
  }

  const busy = phase.kind !== 'idle';
  const mayUpload = group.data?.actions.includes('uploadDataset');
  const columnsError = errors.columns?.message ?? errors.columns?.root?.message;

  return (
    <div>
      <GroupHeader groupId={groupId} current="datasets" />
      <h2 className="mb-1 text-2xl">Upload a dataset</h2>
      <p className="mb-5 max-w-3xl text-ink-soft">
        A CSV or TSV file of at most {formatBytes(20 * 1024 * 1024)}: a header line naming the columns, then one row per point — for
        instance walk length T, mean-square end-to-end distance and its standard error.
      </p>
      {group.data && !mayUpload && <Notice kind="error">As {group.data.role} you may not upload datasets.</Notice>}
      {mayUpload && (
        <form onSubmit={form.handleSubmit(submit)} noValidate aria-label="Upload a dataset" className="flex flex-col gap-6">
          <FieldShell id={fileId} label="File" hint="Checked by its content, whatever its name." error={fileProblem ? fileProblem.message : undefined}>
            <input
              id={fileId}
              type="file"
              accept=".csv,.tsv,.txt,.dat,text/csv,text/tab-separated-values,text/plain"
              onChange={(e) => void choose(e.target.files?.[0])}
              disabled={busy}
              className="text-base file:mr-3 file:rounded file:border file:border-rule file:bg-white/70 file:px-3 file:py-1.5 file:text-ink"
            />
          </FieldShell>

          {chosen && preview && (
            <>
              <section aria-label="Preview">
                <h3 className="mb-1 text-xl">First rows</h3>
                <p className="mb-2 text-sm text-ink-soft">
                  {chosen.file.name} · {formatBytes(chosen.file.size)} ·{' '}
                  {chosen.detected ? `reads as ${formatWords[chosen.detected]}` : 'the separator could not be told from the content'}
                  {!chosen.complete && ' · the whole file is checked when you upload'}
                </p>
                <PreviewTable preview={preview} />
              </section>

              <div className="grid max-w-3xl gap-4 sm:grid-cols-2">
                <TextField id="dataset-name" label="Name" error={errors.name?.message} {...form.register('name')} />
                <SelectField
                  id="dataset-format"
                  label="Format"
                  options={[
                    { value: 'csv', label: formatWords.csv },
                    { value: 'tsv', label: formatWords.tsv },
                  ]}
                  error={errors.format?.message}
                  {...form.register('format')}
                />
                <div className="sm:col-span-2">
                  <FieldShell id="dataset-description" label="Description" error={errors.description?.message} hint="Where the numbers come from: simulation, enumeration, measurement.">
                    <textarea
                      id="dataset-description"
                      rows={3}
                      className="w-full rounded border border-rule bg-white/70 px-2.5 py-1.5 text-base text-ink focus:border-accent"
                      {...form.register('description')}
                    />
                  </FieldShell>
                </div>
              </div>

              <fieldset className="max-w-4xl">
                <legend className="mb-2 text-xl">What the columns mean</legend>
                {columnsError && (
                  <p role="alert" className="mb-2 text-verdict-fails">
                    {columnsError}
                  </p>
                )}
                <div className="flex flex-col gap-3">
                  {columns.fields.map((field, i) => (
                    <div key={field.id} className="grid items-start gap-3 rounded border border-rule bg-white/40 p-3 sm:grid-cols-[10rem_1fr_1fr_8rem]">
                      <p className="pt-6 font-mono text-sm" id={`column-${i}-header`}>
                        {preview.header[i] || `column ${i + 1}`}
                      </p>
                      <SelectField
                        id={`column-${i}-role`}
                        label={`Column “${preview.header[i]}” holds`}
                        options={roleOptions}
                        error={errors.columns?.[i]?.role?.message}
                        {...form.register(`columns.${i}.role`)}
                      />
                      <TextField
                        id={`column-${i}-quantity`}
                        label="Meaning"
                        placeholder="e.g. walk length T"
                        error={errors.columns?.[i]?.quantity?.message}
                        {...form.register(`columns.${i}.quantity`)}
                      />
                      <TextField id={`column-${i}-unit`} label="Unit" placeholder="e.g. steps" error={errors.columns?.[i]?.unit?.message} {...form.register(`columns.${i}.unit`)} />
                    </div>
                  ))}
                </div>
              </fieldset>

              {issues && <IssueList issues={issues.list} total={issues.total} title={issues.title} />}
              {serverError && <Notice kind="error">{serverError}</Notice>}
              {phase.kind !== 'idle' && (
                <div className="max-w-xl" role="status">
                  <label htmlFor="upload-progress" className="text-sm text-ink-soft">
                    {phase.kind === 'checking' ? 'Reading and checking the file' : 'Sending the file'}: {Math.round(phase.share * 100)}%
                  </label>
                  <progress id="upload-progress" max={1} value={phase.share} className="block h-2 w-full accent-[#1f5f5b]" />
                </div>
              )}
              <div className="flex gap-3">
                <Button type="submit" busy={busy}>
                  Check and upload
                </Button>
                <Link href={`/groups/${groupId}/datasets`} className="rounded border border-rule px-3 py-1.5 text-ink hover:border-ink-faint">
                  Cancel
                </Link>
              </div>
            </>
          )}
        </form>
      )}
    </div>
  );
}

function PreviewTable({ preview }: { preview: TableRead }) {
  return (
    <div className="max-h-80 overflow-auto rounded border border-rule">
      <table className="w-full border-collapse text-left font-mono text-sm" data-testid="preview-table">
        <caption className="sr-only">The first rows of the file</caption>
        <thead className="sticky top-0 bg-paper">
          <tr className="border-b border-ink/20">
            <th scope="col" className="px-2 py-1 text-ink-faint">line</th>
            {preview.header.map((h, i) => (
              <th key={i} scope="col" className="px-2 py-1 font-semibold">
                {h}
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {preview.previewRows.map((row, r) => (
            <tr key={r} className="border-b border-rule last:border-b-0">
              <td className="px-2 py-0.5 text-ink-faint">{preview.lines[r]}</td>
              {row.map((cell, c) => (
                <td key={c} className="px-2 py-0.5">
                  {cell}
                </td>
              ))}
            </tr>
          ))}
        </tbody>
      </table>
      {preview.issueCount > 0 && (
        <p className="border-t border-rule px-2 py-1 text-sm text-verdict-fails">
          Already in the first rows: {preview.issues[0]!.line ? `line ${preview.issues[0]!.line}: ` : ''}
          {preview.issues[0]!.message}
        </p>
      )}
    </div>
  );
}
