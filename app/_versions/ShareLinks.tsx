'use client';
// The lead's share links of a locked version: make one (days it works, a note), see the address
// once, list and revoke them.
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import { Button, Notice, TextField, When } from '@/components/ui';
import { fetchJson } from '@/app/_lib/fetchJson';
import type { Wire } from '@/app/_lib/wire';
import type { ShareLinkView } from '@/server/versions/shareLinks';

export function ShareLinks({ derivationId, versionId }: { derivationId: string; versionId: string }) {
  const queryClient = useQueryClient();
  const key = ['share-links', versionId];
  const links = useQuery({ queryKey: key, queryFn: () => fetchJson<{ links: Wire<ShareLinkView>[] }>(`/api/derivations/${derivationId}/versions/${versionId}/share-links`) });
  const [days, setDays] = useState('30');
  const [note, setNote] = useState('');
  const [made, setMade] = useState<string | null>(null);
  const create = useMutation({
    mutationFn: () => fetchJson<{ url: string }>(`/api/derivations/${derivationId}/versions/${versionId}/share-links`, { method: 'POST', body: { days: Number(days), note } }),
    onSuccess: (answer) => {
      setMade(answer.url);
      setNote('');
      void queryClient.invalidateQueries({ queryKey: key });
    },
  });
  const revoke = useMutation({
    mutationFn: (linkId: string) => fetchJson(`/api/derivations/${derivationId}/share-links/${linkId}`, { method: 'DELETE' }),
    onSuccess: () => void queryClient.invalidateQueries({ queryKey: key }),
  });

  return (
    <section aria-label="Share links" className="mt-8">
      <h2 className="mb-2 border-b border-rule pb-1 text-xl">Share links</h2>
      <p className="mb-3 text-sm text-ink-soft">Anyone with a share link reads this locked version — nothing else of the group — until the link expires or you revoke it.</p>
      <form
        className="flex flex-wrap items-end gap-3"
        onSubmit={(event) => {
          event.preventDefault();
          create.mutate();
        }}
      >
        <div className="w-28">
          <TextField id="share-days" label="Works for (days)" type="number" min={1} max={365} value={days} onChange={(e) => setDays(e.target.value)} />
        </div>
        <div className="min-w-[14rem] flex-1">
          <TextField id="share-note" label="Note (for your list)" value={note} onChange={(e) => setNote(e.target.value)} placeholder="e.g. for the referee" />
        </div>
        <Button type="submit" busy={create.isPending}>
          Make a share link
        </Button>
      </form>
      {create.error && (
        <div className="mt-2">
          <Notice kind="error">{create.error.message}</Notice>
        </div>
      )}
      {made && (
        <div className="mt-3">
          <Notice kind="done">
            Share link made. Copy it now: it is shown only once.
            <br />
            <a className="break-all font-mono text-sm underline" href={made} data-share-url>
              {made}
            </a>
          </Notice>
        </div>
      )}
      {links.data && links.data.links.length > 0 && (
        <table className="mt-4 w-full text-sm">
          <thead>
            <tr className="border-b border-rule text-left text-ink-soft">
              <th className="py-1 font-normal">Note</th>
              <th className="py-1 font-normal">Made</th>
              <th className="py-1 font-normal">Expires</th>
              <th className="py-1 font-normal">State</th>
              <th />
            </tr>
          </thead>
          <tbody>
            {links.data.links.map((link) => (
              <tr key={link.id} className="border-b border-rule/60">
                <td className="py-1">{link.note || '—'}</td>
                <td className="py-1">
                  <When iso={link.createdAt} /> {link.createdBy ? `by ${link.createdBy}` : ''}
                </td>
                <td className="py-1">
                  <When iso={link.expiresAt} />
                </td>
                <td className="py-1">{link.state}</td>
                <td className="py-1 text-right">
                  {link.state === 'active' && (
                    <Button kind="danger" busy={revoke.isPending && revoke.variables === link.id} onClick={() => revoke.mutate(link.id)}>
                      Revoke
                    </Button>
                  )}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
    </section>
  );
}
