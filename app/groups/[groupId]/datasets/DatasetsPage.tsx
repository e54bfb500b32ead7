'use client';
// The group's datasets: what each holds, who uploaded it and when, and a CSV download.
import { useQuery } from '@tanstack/react-query';
import type { ColumnDef } from '@tanstack/react-table';
import Link from 'next/link';
import { useMemo } from 'react';
import { DataTable } from '@/components/DataTable';
import { Loading, Notice, When } from '@/components/ui';
import type { DatasetSummary } from '@/server/datasets/store';
import { formatBytes } from '@/server/datasets/table';
import { fetchJson } from '../../../_lib/fetchJson';
import type { Wire } from '../../../_lib/wire';
import { GroupHeader } from '../GroupHeader';
import { useGroup } from '../useGroup';

type Row = Wire<DatasetSummary>;

export const axisWords = (axis: Row['x']) => (axis ? `${axis.quantity}${axis.unit ? ` [${axis.unit}]` : ''}` : '—');

export function DatasetsPage({ groupId }: { groupId: string }) {
  const group = useGroup(groupId);
  const datasets = useQuery({
    queryKey: ['datasets', groupId],
    queryFn: () => fetchJson<{ datasets: Row[] }>(`/api/groups/${groupId}/datasets`),
    enabled: group.isSuccess,
  });
  const mayUpload = group.data?.actions.includes('uploadDataset') ?? false;

  const columns = useMemo<ColumnDef<Row, unknown>[]>(
    () => [
      {
        id: 'name',
        header: 'Dataset',
        accessorFn: (row) => `${row.name} ${row.description}`,
        cell: ({ row }) => (
          <div>
            <Link href={`/groups/${groupId}/datasets/${row.original.id}`} className="text-lg text-accent hover:underline">
              {row.original.name}
            </Link>
            {row.original.description && <p className="max-w-md text-sm text-ink-soft">{row.original.description}</p>}
          </div>
        ),
      },
      {
        id: 'holds',
        header: 'Holds',
        accessorFn: (row) => `${axisWords(row.y)} against ${axisWords(row.x)}`,
        cell: ({ row }) => (
          <span className="text-ink-soft">
            {axisWords(row.original.y)} against {axisWords(row.original.x)}
            {row.original.hasErrorBars && <span className="block text-sm text-ink-faint">with error bars</span>}
          </span>
        ),
      },
      {
        id: 'rows',
        header: 'Rows',
        accessorFn: (row) => row.rowCount,
        enableGlobalFilter: false,
        cell: ({ row }) => (
          <span className="whitespace-nowrap text-ink-soft">
            {row.original.rowCount.toLocaleString('en-GB')}
            <span className="block text-sm text-ink-faint">
              {row.original.format.toUpperCase()}, {formatBytes(row.original.fileBytes)}
            </span>
          </span>
        ),
      },
      {
        id: 'uploadedAt',
        header: 'Uploaded',
        accessorFn: (row) => row.uploadedAt,
        enableGlobalFilter: false,
        cell: ({ row }) => (
          <span className="whitespace-nowrap text-ink-soft">
            <When iso={row.original.uploadedAt} />
            <span className="block text-sm text-ink-faint">by {row.original.uploadedBy ?? 'a former member'}</span>
          </span>
        ),
      },
      {
        id: 'download',
        header: 'Download',
        enableSorting: false,
        enableGlobalFilter: false,
        cell: ({ row }) => (
          <a href={`/api/groups/${groupId}/datasets/${row.original.id}/download`} className="text-accent hover:underline" download>
            CSV
          </a>
        ),
      },
    ],
    [groupId],
  );

  return (
    <div>
      <GroupHeader groupId={groupId} current="datasets" />
      {mayUpload && (
        <p className="mb-4">
          <Link href={`/groups/${groupId}/datasets/new`} className="rounded border border-accent bg-accent px-3 py-1.5 text-paper hover:bg-accent-strong">
            Upload a dataset
          </Link>
        </p>
      )}
      {datasets.isPending && group.isSuccess && <Loading what="datasets" />}
      {datasets.error && <Notice kind="error">{datasets.error.message}</Notice>}
      {datasets.data && (
        <DataTable
          caption="Datasets of this group"
          data={datasets.data.datasets}
          columns={columns}
          rowId={(row) => row.id}
          initialSorting={[{ id: 'uploadedAt', desc: true }]}
          filterPlaceholder="name, quantity or description"
          empty={mayUpload ? 'No datasets yet. Upload a CSV or TSV file to compare it with a flow.' : 'No datasets yet.'}
        />
      )}
    </div>
  );
}
