'use client';
// The derivation's page: its heading, a line of facts, and the whiteboard (the shared text).
import { useQuery, useQueryClient } from '@tanstack/react-query';
import { IntentLink } from '@/components/IntentLink';
import { useCallback, useEffect, useState } from 'react';
import { clientModule } from '@/components/clientModule';
import { markOnce } from '@/components/performanceMark';
import { ClaimCount } from '@/components/StatusWord';
import { Loading, Notice, PageTitle, When } from '@/components/ui';
import { VersionsPanel } from '@/app/_versions/VersionsPanel';
import { fetchTextAhead } from '@/editor/textAhead';
import { fetchJson } from '../../_lib/fetchJson';
import type { DerivationView, Wire } from '../../_lib/wire';
import { ReviewPane } from './ReviewPane';
import { requestServerCopy } from './serverCopy';

// The editor and its connection live in the browser only (Yjs, IndexedDB, websocket). Its code,
// the text's fonts and KaTeX are fetched as soon as this page's code runs, alongside the facts.
const whiteboardCode = clientModule(() => import('./Whiteboard'));
if (typeof window !== 'undefined') void whiteboardCode.fetch();
fetchTextAhead();

export function DerivationPage({ derivationId, user }: { derivationId: string; user: { id: string; name: string } }) {
  const queryClient = useQueryClient();
  // The text's server copy is fetched with the page's facts, before the whiteboard's code has run.
  useState(() => requestServerCopy(derivationId));
  const derivation = useQuery({
    queryKey: ['derivation', derivationId],
    queryFn: () => fetchJson<Wire<DerivationView>>(`/api/derivations/${derivationId}`),
  });
  const whiteboard = whiteboardCode.use();
  useEffect(() => {
    if (derivation.data) markOnce('marginalia:facts-shown');
  }, [derivation.data]);
  const Whiteboard = whiteboard.module?.default;
  const [textShown, setTextShown] = useState(false);
  const onTextShown = useCallback(() => setTextShown(true), []);
  const onRoleChanged = useCallback(() => {
    void queryClient.invalidateQueries({ queryKey: ['derivation', derivationId] });
  }, [queryClient, derivationId]);

  if (derivation.isPending) return <Loading what="the derivation" />;
  if (derivation.error) return <Notice kind="error">{derivation.error.message}</Notice>;
  const d = derivation.data;
  const checked = d.claimsHolding + d.claimsFailing > 0;
  return (
    <article>
      <PageTitle
        eyebrow={
          <IntentLink href={`/groups/${d.groupId}`} className="hover:text-ink">
            {d.groupName}
          </IntentLink>
        }
      >
        {d.title}
      </PageTitle>
      <dl className="flex flex-wrap gap-x-8 gap-y-1 text-sm text-ink-soft">
        <div className="flex gap-2">
          <dt>Authors</dt>
          <dd className="text-ink">{d.authors.map((a) => a.name).join(', ') || '—'}</dd>
        </div>
        <div className="flex gap-2">
          <dt>Claims</dt>
          <dd className="flex gap-3 text-ink">
            <ClaimCount status="holds" count={d.claimsHolding} checked={checked} />
            {checked && <ClaimCount status="fails" count={d.claimsFailing} checked={checked} />}
          </dd>
        </div>
        <div className="flex gap-2">
          <dt>Last edit</dt>
          <dd className="text-ink">
            <When iso={d.updatedAt} />
          </dd>
        </div>
        <div className="flex gap-2">
          <dt>Locked versions</dt>
          <dd className="text-ink">{d.lockedVersions === 0 ? 'none' : d.lockedVersions}</dd>
        </div>
        <div className="flex gap-2">
          <dt>You are</dt>
          <dd className="text-ink">{d.role}</dd>
        </div>
      </dl>
      <ReviewPane derivationId={derivationId} user={user} canEdit={d.actions.includes('editText')} textShown={textShown}>
        {whiteboard.failed ? (
          <Notice kind="error">The editor's code could not be fetched. Check the connection and reload the page.</Notice>
        ) : !Whiteboard ? (
          <p className="text-ink-faint" role="status">
            Opening the derivation…
          </p>
        ) : (
          <Whiteboard
            key={`${derivationId}:${d.role}`}
            derivationId={derivationId}
            title={d.title}
            user={user}
            role={d.role}
            canEdit={d.actions.includes('editText')}
            onRoleChanged={onRoleChanged}
            onTextShown={onTextShown}
          />
        )}
      </ReviewPane>
      <VersionsPanel derivationId={derivationId} actions={d.actions} />
    </article>
  );
}
