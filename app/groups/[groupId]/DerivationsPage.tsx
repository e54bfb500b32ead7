'use client';
import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { ColumnDef } from '@tanstack/react-table';
import Link from 'next/link';
import { useMemo, useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { DataTable } from '@/components/DataTable';
import { LockIcon } from '@/components/icons';
import { ClaimCount } from '@/components/StatusWord';
import { Button, Loading, Notice, Section, TextField, When } from '@/components/ui';
import { ApiFailure, fetchJson } from '../../_lib/fetchJson';
import { derivationSchema } from '../../_lib/schemas';
import type { DerivationRow, Wire } from '../../_lib/wire';
import { GroupHeader } from './GroupHeader';
import { useGroup } from './useGroup';

type Row = Wire<DerivationRow>;
type TitleForm = z.input<typeof derivationSchema>;

function titleError(error: unknown): string {
  return error instanceof Error ? error.message : 'That did not work.';
}

export function DerivationsPage({ groupId }: { groupId: string }) {
  const group = useGroup(groupId);
  const key = ['derivations', groupId];
  const derivations = useQuery({
    queryKey: key,
    queryFn: () => fetchJson<{ derivations: Row[] }>(`/api/groups/${groupId}/derivations`),
    enabled: group.isSuccess,
  });
  const may = new Set(group.data?.actions ?? []);
  const canRename = may.has('renameDerivation');
  const canDelete = may.has('deleteDerivation');

  const columns = useMemo<ColumnDef<Row, unknown>[]>(
    () => [
      {
        id: 'title',
        header: 'Title',
        accessorFn: (row) => row.title,
        cell: ({ row }) => <TitleCell row={row.original} groupId={groupId} canRename={canRename} canDelete={canDelete} />,
      },
      {
        id: 'authors',
        header: 'Authors',
        accessorFn: (row) => row.authors.map((a) => a.name).join(', '),
        cell: ({ getValue }) => <span className="text-ink-soft">{String(getValue() || '—')}</span>,
      },
      {
        id: 'claimsHolding',
        header: 'Claims holding',
        accessorFn: (row) => row.claimsHolding,
        enableGlobalFilter: false,
        cell: ({ row }) => <ClaimCount status="holds" count={row.original.claimsHolding} checked={row.original.claimsCheckedAt !== null} />,
      },
      {
        id: 'claimsFailing',
        header: 'Claims failing',
        accessorFn: (row) => row.claimsFailing,
        enableGlobalFilter: false,
        cell: ({ row }) => <ClaimCount status="fails" count={row.original.claimsFailing} checked={row.original.claimsCheckedAt !== null} />,
      },
      {
        id: 'updatedAt',
        header: 'Last edit',
        accessorFn: (row) => row.updatedAt,
        enableGlobalFilter: false,
        cell: ({ row }) => (
          <span className="whitespace-nowrap text-ink-soft">
            <When iso={row.original.updatedAt} />
            {row.original.updatedBy && <span className="block text-sm text-ink-faint">by {row.original.updatedBy}</span>}
          </span>
        ),
      },
      {
        id: 'lockedVersions',
        header: 'Locked versions',
        accessorFn: (row) => row.lockedVersions,
        enableGlobalFilter: false,
        cell: ({ row }) => (
          <span className="inline-flex items-center gap-1 text-ink-soft">
            {row.original.lockedVersions > 0 && <LockIcon />}
            {row.original.lockedVersions === 0 ? 'none' : row.original.lockedVersions}
          </span>
        ),
      },
    ],
    [groupId, canRename, canDelete],
  );

  return (
    <div>
      <GroupHeader groupId={groupId} current="derivations" />
      {derivations.isPending && group.isSuccess && <Loading what="derivations" />}
      {derivations.error && <Notice kind="error">{derivations.error.message}</Notice>}
      {derivations.data && (
        <DataTable
          caption="Derivations of this group"
          data={derivations.data.derivations}
          columns={columns}
          rowId={(row) => row.id}
          initialSorting={[{ id: 'updatedAt', desc: true }]}
          filterPlaceholder="title or author"
          empty="No derivations yet."
        />
      )}
      {may.has('createDerivation') && <NewDerivationForm groupId={groupId} />}
    </div>
  );
}

function TitleCell({ row, groupId, canRename, canDelete }: { row: Row; groupId: string; canRename: boolean; canDelete: boolean }) {
  const [mode, setMode] = useState<'view' | 'rename' | 'confirmDelete'>('view');
  const queryClient = useQueryClient();
  const refresh = () => queryClient.invalidateQueries({ queryKey: ['derivations', groupId] });
  const form = useForm<TitleForm>({ resolver: zodResolver(derivationSchema), defaultValues: { title: row.title } });
  const rename = useMutation({
    mutationFn: (values: TitleForm) => fetchJson(`/api/derivations/${row.id}`, { method: 'PATCH', body: values }),
    onSuccess: async () => {
      await refresh();
      setMode('view');
    },
    onError: (error) => form.setError('title', { message: titleError(error) }),
  });
  const remove = useMutation({
    mutationFn: () => fetchJson(`/api/derivations/${row.id}`, { method: 'DELETE' }),
    onSuccess: refresh,
  });

  if (mode === 'rename') {
    return (
      <form onSubmit={form.handleSubmit((v) => rename.mutate(v))} noValidate className="flex flex-col gap-2" aria-label={`Rename ${row.title}`}>
        <TextField id={`rename-${row.id}`} label="New title" autoFocus error={form.formState.errors.title?.message} {...form.register('title')} />
        <div className="flex gap-2">
          <Button type="submit" busy={rename.isPending}>
            Save title
          </Button>
          <Button kind="quiet" onClick={() => setMode('view')}>
            Cancel
          </Button>
        </div>
      </form>
    );
  }
  return (
    <div>
      <Link href={`/derivations/${row.id}`} className="text-lg text-accent hover:underline">
        {row.title}
      </Link>
      {(canRename || canDelete) && mode === 'view' && (
        <div className="mt-1 flex gap-3 text-sm">
          {canRename && (
            <button type="button" className="rounded text-ink-faint hover:text-ink" onClick={() => setMode('rename')}>
              Rename
            </button>
          )}
          {canDelete && (
            <button type="button" className="rounded text-ink-faint hover:text-verdict-fails" onClick={() => setMode('confirmDelete')}>
              Delete
            </button>
          )}
        </div>
      )}
      {mode === 'confirmDelete' && (
        <div className="mt-2 flex flex-wrap items-center gap-2 text-sm" role="group" aria-label="Confirm deletion">
          <span>Delete this derivation?</span>
          <Button kind="danger" busy={remove.isPending} onClick={() => remove.mutate()}>
            Delete
          </Button>
          <Button kind="quiet" onClick={() => setMode('view')}>
            Keep it
          </Button>
          {remove.error && <span className="text-verdict-fails" role="alert">{remove.error.message}</span>}
        </div>
      )}
    </div>
  );
}

function NewDerivationForm({ groupId }: { groupId: string }) {
  const queryClient = useQueryClient();
  const form = useForm<TitleForm>({ resolver: zodResolver(derivationSchema), defaultValues: { title: '' } });
  const create = useMutation({
    mutationFn: (values: TitleForm) => fetchJson<{ id: string }>(`/api/groups/${groupId}/derivations`, { method: 'POST', body: values }),
    onSuccess: async () => {
      form.reset({ title: '' });
      await queryClient.invalidateQueries({ queryKey: ['derivations', groupId] });
    },
    onError: (error) =>
      form.setError(error instanceof ApiFailure && error.field === 'title' ? 'title' : 'root.server', { message: titleError(error) }),
  });
  const { errors } = form.formState;
  return (
    <Section title="New derivation">
      <form onSubmit={form.handleSubmit((v) => create.mutate(v))} noValidate className="flex max-w-xl flex-col gap-3" aria-label="New derivation">
        {errors.root?.server && <Notice kind="error">{errors.root.server.message}</Notice>}
        <TextField id="new-derivation-title" label="Title" error={errors.title?.message} {...form.register('title')} />
        <div className="flex items-center gap-4">
          <Button type="submit" busy={create.isPending}>
            Create derivation
          </Button>
          <Link href={`/groups/${groupId}/import`} className="text-accent hover:underline">
            or import a LaTeX file
          </Link>
        </div>
      </form>
    </Section>
  );
}
