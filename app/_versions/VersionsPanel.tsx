'use client';
// The derivation page's versions: the history (number, name, who, when, verdicts, lock and hash),
// saving the working copy as a named version, the lead's lock (refused with the claims that do
// not hold, or done with its SHA-256), and comparing two versions.
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { IntentLink } from '@/components/IntentLink';
import { useRouter } from 'next/navigation';
import { useState } from 'react';
import { StatusWord } from '@/components/StatusWord';
import { Button, Notice, SelectField, TextField, When } from '@/components/ui';
import { ApiFailure, fetchJson } from '@/app/_lib/fetchJson';
import type { Action, Wire } from '@/app/_lib/wire';
import type { VersionDetail, VersionSummary } from '@/server/versions/types';
import { LockRefusal, requestLock, type LockResult } from './LockRefusal';

interface Props {
  derivationId: string;
  actions: readonly Action[];
}

async function lockNow(derivationId: string, name: string): Promise<LockResult<Wire<VersionDetail>>> {
  return requestLock<Wire<VersionDetail>>(`/api/derivations/${derivationId}/lock`, name.trim() ? { name } : {});
}

export function VersionsPanel({ derivationId, actions }: Props) {
  const queryClient = useQueryClient();
  const router = useRouter();
  const key = ['versions', derivationId];
  const versions = useQuery({ queryKey: key, queryFn: () => fetchJson<{ versions: Wire<VersionSummary>[] }>(`/api/derivations/${derivationId}/versions`) });
  const [name, setName] = useState('');
  const [lockName, setLockName] = useState('');
  const [from, setFrom] = useState('');
  const [to, setTo] = useState('working');
  const refresh = () => {
    void queryClient.invalidateQueries({ queryKey: key });
    void queryClient.invalidateQueries({ queryKey: ['derivation', derivationId] });
  };
  const save = useMutation({
    mutationFn: () => fetchJson<Wire<VersionDetail>>(`/api/derivations/${derivationId}/versions`, { method: 'POST', body: { name } }),
    onSuccess: () => {
      setName('');
      refresh();
    },
  });
  const lock = useMutation({ mutationFn: () => lockNow(derivationId, lockName), onSuccess: (result) => result.kind === 'locked' && refresh() });

  const list = versions.data?.versions ?? [];
  const earlier = from || list[list.length > 1 ? 1 : 0]?.id || '';
  const mayLock = actions.includes('lock');

  return (
    <section aria-label="Versions" className="mt-10">
      <h2 className="mb-3 border-b border-rule pb-1 text-xl">Versions</h2>
      {versions.error && <Notice kind="error">{versions.error.message}</Notice>}
      {list.length === 0 ? (
        <p className="text-ink-soft">No versions yet. Save one to keep the working copy as it stands now.</p>
      ) : (
        <ol className="divide-y divide-rule/70">
          {list.map((v) => (
            <li key={v.id} className="flex flex-wrap items-baseline gap-x-4 gap-y-1 py-1.5" data-version={v.number}>
              <IntentLink className="text-accent underline-offset-2 hover:underline" href={`/derivations/${derivationId}/versions/${v.id}`}>
                Version {v.number}: {v.name}
              </IntentLink>
              <span className="text-sm text-ink-soft">
                <When iso={v.createdAt} />
                {v.createdBy ? `, ${v.createdBy.name}` : ''}
              </span>
              <span className="flex gap-2 text-sm">
                {v.summary.claims === 0 ? (
                  <span className="text-ink-faint">no claims</span>
                ) : (
                  <>
                    <StatusWord status="holds" label={`${v.summary.holds} of ${v.summary.claims} hold`} />
                    {v.summary.fails > 0 && <StatusWord status="fails" label={`${v.summary.fails} fail${v.summary.fails === 1 ? 's' : ''}`} />}
                  </>
                )}
              </span>
              {v.locked && (
                <span className="text-sm">
                  <span className="rounded border border-accent/50 px-1.5 text-accent">locked</span>{' '}
                  <span className="font-mono text-xs text-ink-soft" title={v.locked.sha256}>
                    SHA-256 {v.locked.sha256.slice(0, 12)}…
                  </span>
                </span>
              )}
            </li>
          ))}
        </ol>
      )}

      <div className="mt-5 grid gap-6 md:grid-cols-2">
        {actions.includes('saveVersion') && (
          <form
            aria-label="Save a version"
            className="flex items-end gap-2"
            onSubmit={(event) => {
              event.preventDefault();
              save.mutate();
            }}
          >
            <div className="flex-1">
              <TextField
                id="version-name"
                label="Save the working copy as a version"
                placeholder="a name, e.g. two loops done"
                value={name}
                onChange={(e) => setName(e.target.value)}
                error={save.error instanceof ApiFailure && save.error.field === 'name' ? save.error.message : undefined}
              />
            </div>
            <Button type="submit" kind="quiet" busy={save.isPending}>
              Save version
            </Button>
          </form>
        )}
        {list.length > 0 && (
          <form
            aria-label="Compare versions"
            className="flex flex-wrap items-end gap-2"
            onSubmit={(event) => {
              event.preventDefault();
              if (earlier) router.push(`/derivations/${derivationId}/versions/compare?from=${earlier}&to=${to}`);
            }}
          >
            <div className="min-w-[9rem] flex-1">
              <SelectField id="compare-from" label="Compare" value={earlier} onChange={(e) => setFrom(e.target.value)} options={list.map((v) => ({ value: v.id, label: `Version ${v.number}` }))} />
            </div>
            <div className="min-w-[9rem] flex-1">
              <SelectField
                id="compare-to"
                label="with"
                value={to}
                onChange={(e) => setTo(e.target.value)}
                options={[{ value: 'working', label: 'the working copy' }, ...list.map((v) => ({ value: v.id, label: `Version ${v.number}` }))]}
              />
            </div>
            <Button type="submit" kind="quiet">
              Compare
            </Button>
          </form>
        )}
      </div>
      {save.error && !(save.error instanceof ApiFailure && save.error.field) && (
        <div className="mt-2">
          <Notice kind="error">{save.error.message}</Notice>
        </div>
      )}

      {mayLock && (
        <div className="mt-6 rounded border border-rule bg-white/60 px-4 py-3">
          <h3 className="text-lg">Lock a version</h3>
          <p className="mb-2 text-sm text-ink-soft">
            The server checks every claim of the working copy again; the lock succeeds only if all of them hold. A locked version never changes and carries its check
            report and SHA-256.
          </p>
          <form
            aria-label="Lock the working copy"
            className="flex flex-wrap items-end gap-2"
            onSubmit={(event) => {
              event.preventDefault();
              lock.mutate();
            }}
          >
            <div className="min-w-[14rem] flex-1">
              <TextField id="lock-name" label="Name of the locked version (optional)" value={lockName} onChange={(e) => setLockName(e.target.value)} />
            </div>
            <Button type="submit" busy={lock.isPending}>
              {lock.isPending ? 'Checking every claim…' : 'Lock the working copy'}
            </Button>
          </form>
          {lock.data?.kind === 'refused' && <LockRefusal error={lock.data.error} claims={lock.data.claims} />}
          {lock.data?.kind === 'error' && (
            <div className="mt-3">
              <Notice kind="error">{lock.data.error}</Notice>
            </div>
          )}
          {lock.data?.kind === 'locked' && (
            <div className="mt-3" data-lock-done>
              <Notice kind="done">
                Locked as{' '}
                <IntentLink className="underline" href={`/derivations/${derivationId}/versions/${lock.data.version.id}`}>
                  version {lock.data.version.number}
                </IntentLink>
                : all {lock.data.version.summary.claims} claims hold.
                <br />
                SHA-256 <span className="break-all font-mono text-sm" data-lock-hash>{lock.data.version.locked?.sha256}</span>
              </Notice>
            </div>
          )}
        </div>
      )}
    </section>
  );
}
