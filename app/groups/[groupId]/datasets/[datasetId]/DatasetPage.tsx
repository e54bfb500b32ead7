'use client';
// One dataset: where it came from, its columns and first rows, the downloads, and the data drawn
// with their error bars beside a fit to A x^a |ln x|^p.
import { useQuery } from '@tanstack/react-query';
import Link from 'next/link';
import { FitPanel } from '@/components/datasets/FitPanel';
import { Loading, Notice, Section, When } from '@/components/ui';
import type { DatasetDetail, DatasetSeries } from '@/server/datasets/store';
import { formatBytes } from '@/server/datasets/table';
import { fetchJson } from '../../../../_lib/fetchJson';
import type { Wire } from '../../../../_lib/wire';
import { GroupHeader } from '../../GroupHeader';
import { useGroup } from '../../useGroup';

const roleWords = { x: 'x', y: 'y', sigma: 'error bar of y', other: 'other' } as const;

export function DatasetPage({ groupId, datasetId }: { groupId: string; datasetId: string }) {
  const group = useGroup(groupId);
  const base = `/api/groups/${groupId}/datasets/${datasetId}`;
  const detail = useQuery({ queryKey: ['dataset', groupId, datasetId], queryFn: () => fetchJson<Wire<DatasetDetail>>(base), enabled: group.isSuccess });
  const series = useQuery({
    queryKey: ['dataset-columns', groupId, datasetId],
    queryFn: () => fetchJson<DatasetSeries>(`${base}/columns`),
    enabled: detail.isSuccess,
    staleTime: Infinity, // a stored dataset never changes
  });

  return (
    <div>
      <GroupHeader groupId={groupId} current="datasets" />
      <p className="mb-3 text-sm">
        <Link href={`/groups/${groupId}/datasets`} className="text-accent hover:underline">
          All datasets
        </Link>
      </p>
      {detail.isPending && group.isSuccess && <Loading what="the dataset" />}
      {detail.error && <Notice kind="error">{detail.error.message}</Notice>}
      {detail.data && (
        <article>
          <h2 className="text-2xl">{detail.data.name}</h2>
          {detail.data.description && <p className="mt-1 max-w-3xl text-lg text-ink-soft">{detail.data.description}</p>}
          <dl className="mt-4 grid max-w-3xl grid-cols-[10rem_1fr] gap-x-4 gap-y-1">
            <dt className="text-ink-soft">File</dt>
            <dd>
              {detail.data.fileName} · {detail.data.format.toUpperCase()} · {formatBytes(detail.data.fileBytes)} · {detail.data.rowCount.toLocaleString('en-GB')} rows
            </dd>
            <dt className="text-ink-soft">Uploaded</dt>
            <dd>
              <When iso={detail.data.uploadedAt} /> by {detail.data.uploadedBy ?? 'a former member'}
            </dd>
            <dt className="text-ink-soft">SHA-256</dt>
            <dd className="break-all font-mono text-sm">{detail.data.fileSha256}</dd>
            <dt className="text-ink-soft">Download</dt>
            <dd className="flex gap-4">
              <a href={`${base}/download`} download className="text-accent hover:underline">
                as CSV
              </a>
              <a href={`${base}/download?original=1`} download className="text-accent hover:underline">
                the file as uploaded
              </a>
            </dd>
          </dl>

          <Section title="Columns">
            <table className="w-full border-collapse text-left">
              <caption className="sr-only">Columns of the dataset</caption>
              <thead>
                <tr className="border-b border-ink/20 text-sm text-ink-soft">
                  <th scope="col" className="py-1 pr-3">In the file</th>
                  <th scope="col" className="py-1 pr-3">Holds</th>
                  <th scope="col" className="py-1 pr-3">Meaning</th>
                  <th scope="col" className="py-1">Unit</th>
                </tr>
              </thead>
              <tbody>
                {detail.data.columns.map((c) => (
                  <tr key={c.position} className="border-b border-rule last:border-b-0">
                    <td className="py-1 pr-3 font-mono text-sm">{c.header}</td>
                    <td className="py-1 pr-3">{roleWords[c.role]}</td>
                    <td className="py-1 pr-3">{c.quantity || '—'}</td>
                    <td className="py-1">{c.unit || '—'}</td>
                  </tr>
                ))}
              </tbody>
            </table>
            <details className="mt-3">
              <summary className="cursor-pointer text-ink-soft">First {detail.data.previewRows.length} rows</summary>
              <table className="mt-2 border-collapse text-left font-mono text-sm">
                <thead>
                  <tr className="border-b border-ink/20">
                    {detail.data.columns.map((c) => (
                      <th key={c.position} scope="col" className="px-2 py-1">
                        {c.header}
                      </th>
                    ))}
                  </tr>
                </thead>
                <tbody>
                  {detail.data.previewRows.map((row, r) => (
                    <tr key={r} className="border-b border-rule last:border-b-0">
                      {row.map((cell, c) => (
                        <td key={c} className="px-2 py-0.5">
                          {cell ?? ''}
                        </td>
                      ))}
                    </tr>
                  ))}
                </tbody>
              </table>
            </details>
          </Section>

          <Section title="Plot and fit">
            {series.isPending && <Loading what="the numbers" />}
            {series.error && <Notice kind="error">{series.error.message}</Notice>}
            {series.data && <FitPanel series={series.data} />}
          </Section>
        </article>
      )}
    </div>
  );
}
