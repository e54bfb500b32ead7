'use client';
// Importing a .tex file as a new derivation: its sections, paragraphs and equations become steps;
// what could not be imported is listed here with its lines (and at the end of the derivation).
import { useQueryClient } from '@tanstack/react-query';
import Link from 'next/link';
import { useId, useState } from 'react';
import { Button, FieldShell, Notice, TextField } from '@/components/ui';
import type { ImportResult } from '@/server/latexImport';
import { GroupHeader } from '../GroupHeader';
import { useGroup } from '../useGroup';

const MAX_BYTES = 2 * 1024 * 1024;

export function ImportPage({ groupId }: { groupId: string }) {
  const group = useGroup(groupId);
  const queryClient = useQueryClient();
  const fileId = useId();
  const [file, setFile] = useState<File | null>(null);
  const [title, setTitle] = useState('');
  const [error, setError] = useState<{ message: string; field?: string } | null>(null);
  const [busy, setBusy] = useState(false);
  const [result, setResult] = useState<ImportResult | null>(null);
  const mayCreate = group.data?.actions.includes('createDerivation');

  async function submit(event: React.FormEvent) {
    event.preventDefault();
    setError(null);
    setResult(null);
    if (!file) return setError({ message: 'Choose a .tex file to import.', field: 'file' });
    if (file.size > MAX_BYTES) return setError({ message: 'The file is over the limit of 2 MB for a LaTeX import.', field: 'file' });
    const body = new FormData();
    body.set('file', file, file.name);
    if (title.trim()) body.set('title', title.trim());
    setBusy(true);
    try {
      const response = await fetch(`/api/groups/${groupId}/imports`, { method: 'POST', body, credentials: 'same-origin' });
      const payload = (await response.json().catch(() => null)) as (ImportResult & { error?: string; field?: string }) | null;
      if (response.status === 201 && payload) {
        setResult(payload);
        await queryClient.invalidateQueries({ queryKey: ['derivations', groupId] });
      } else {
        setError({ message: payload?.error ?? `The server answered ${response.status}.`, field: payload?.field });
      }
    } catch {
      setError({ message: 'The file did not reach the server. Check the connection and try again.' });
    } finally {
      setBusy(false);
    }
  }

  return (
    <div>
      <GroupHeader groupId={groupId} current="derivations" />
      <h2 className="mb-1 text-2xl">Import a LaTeX file</h2>
      <p className="mb-5 max-w-3xl text-ink-soft">
        A .tex file of at most 2 MB becomes a new derivation: sections become headings, paragraphs and equations become steps, the
        formulas stay LaTeX and are typeset as you read. Your own \newcommand macros are expanded in the formulas. Figures, tables and
        anything else that has no place in a derivation are listed, with their lines.
      </p>
      {group.data && !mayCreate && <Notice kind="error">As {group.data.role} you may not create derivations.</Notice>}
      {mayCreate && (
        <form onSubmit={submit} noValidate aria-label="Import a LaTeX file" className="flex max-w-xl flex-col gap-4">
          <FieldShell id={fileId} label="LaTeX file" error={error?.field === 'file' ? error.message : undefined}>
            <input
              id={fileId}
              type="file"
              accept=".tex,.ltx,.latex,text/x-tex,application/x-tex,text/plain"
              onChange={(e) => setFile(e.target.files?.[0] ?? null)}
              disabled={busy}
              className="text-base file:mr-3 file:rounded file:border file:border-rule file:bg-white/70 file:px-3 file:py-1.5 file:text-ink"
            />
          </FieldShell>
          <TextField
            id="import-title"
            label="Title of the new derivation"
            hint="Leave empty to take the file’s \title."
            value={title}
            onChange={(e) => setTitle(e.target.value)}
            error={error?.field === 'title' ? error.message : undefined}
          />
          {error && error.field !== 'file' && error.field !== 'title' && <Notice kind="error">{error.message}</Notice>}
          <div>
            <Button type="submit" busy={busy}>
              Import
            </Button>
          </div>
        </form>
      )}
      {result && (
        <section aria-label="Import result" className="mt-8 max-w-4xl">
          <Notice kind="done">
            Imported {result.steps} steps into{' '}
            <Link href={`/derivations/${result.derivationId}`} className="font-semibold underline">
              {result.title}
            </Link>
            .
          </Notice>
          {result.leftOut.length > 0 && (
            <>
              <h3 className="mb-2 mt-5 text-xl">Not imported as it stood</h3>
              <p className="mb-2 text-ink-soft">The same list closes the new derivation, so nothing is lost from sight.</p>
              <table className="w-full border-collapse text-left" data-testid="left-out">
                <caption className="sr-only">What was not imported</caption>
                <thead>
                  <tr className="border-b border-ink/20 text-sm text-ink-soft">
                    <th scope="col" className="py-1 pr-3">What</th>
                    <th scope="col" className="py-1 pr-3">Where</th>
                    <th scope="col" className="py-1">Why</th>
                  </tr>
                </thead>
                <tbody>
                  {result.leftOut.map((item) => (
                    <tr key={item.what} className="border-b border-rule align-top last:border-b-0">
                      <td className="py-1 pr-3 font-mono text-sm">{item.what}</td>
                      <td className="py-1 pr-3 text-ink-soft">{item.where.replace(/^ \(|\)$/g, '') || '—'}</td>
                      <td className="py-1">{item.detail}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </>
          )}
        </section>
      )}
    </div>
  );
}
