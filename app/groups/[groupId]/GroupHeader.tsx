'use client';
import Link from 'next/link';
import { Loading, Notice } from '@/components/ui';
import { useGroup } from './useGroup';

export function GroupHeader({ groupId, current }: { groupId: string; current: 'derivations' | 'datasets' | 'members' }) {
  const group = useGroup(groupId);
  if (group.isPending) return <Loading what="the group" />;
  if (group.error) return <Notice kind="error">{group.error.message}</Notice>;
  const tab = (name: typeof current, href: string, label: string) => (
    <Link
      href={href}
      aria-current={current === name ? 'page' : undefined}
      className={`border-b-2 pb-1 ${current === name ? 'border-accent text-ink' : 'border-transparent text-ink-soft hover:text-ink'}`}
    >
      {label}
    </Link>
  );
  return (
    <header className="mb-6">
      <p className="mb-1 text-sm uppercase tracking-[0.14em] text-ink-faint">Research group · you are {group.data.role}</p>
      <h1 className="text-3xl leading-tight">{group.data.name}</h1>
      {group.data.description && <p className="mt-2 max-w-3xl text-lg text-ink-soft">{group.data.description}</p>}
      <nav aria-label="Group" className="mt-5 flex gap-6 border-b border-rule">
        {tab('derivations', `/groups/${groupId}`, 'Derivations')}
        {tab('datasets', `/groups/${groupId}/datasets`, 'Datasets')}
        {tab('members', `/groups/${groupId}/members`, 'Members')}
      </nav>
    </header>
  );
}
