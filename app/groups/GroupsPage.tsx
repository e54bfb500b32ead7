'use client';
import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import Link from 'next/link';
import { useRouter } from 'next/navigation';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Button, Loading, Notice, PageTitle, Section, TextField } from '@/components/ui';
import { ApiFailure, fetchJson } from '../_lib/fetchJson';
import { groupSchema } from '../_lib/schemas';
import type { GroupSummary, Wire } from '../_lib/wire';

type GroupForm = z.input<typeof groupSchema>;

export function GroupsPage({ userName }: { userName: string }) {
  const groups = useQuery({
    queryKey: ['groups'],
    queryFn: () => fetchJson<{ groups: Wire<GroupSummary>[] }>('/api/groups'),
  });

  return (
    <div>
      <PageTitle eyebrow={`Signed in as ${userName}`}>Your research groups</PageTitle>
      {groups.isPending && <Loading what="your groups" />}
      {groups.error && <Notice kind="error">{groups.error.message}</Notice>}
      {groups.data && groups.data.groups.length === 0 && (
        <p className="text-ink-soft">You are not in a group yet. Start one below, or follow an invitation link you were sent.</p>
      )}
      {groups.data && groups.data.groups.length > 0 && (
        <ul className="divide-y divide-rule border-y border-rule">
          {groups.data.groups.map((group) => (
            <li key={group.id} className="py-3">
              <Link href={`/groups/${group.id}`} className="text-xl text-accent hover:underline">
                {group.name}
              </Link>
              <span className="ml-3 text-ink-faint">
                you are {group.role} · {group.members} {group.members === 1 ? 'member' : 'members'} · {group.derivations}{' '}
                {group.derivations === 1 ? 'derivation' : 'derivations'}
              </span>
              {group.description && <p className="mt-1 max-w-3xl text-ink-soft">{group.description}</p>}
            </li>
          ))}
        </ul>
      )}
      <NewGroupForm />
    </div>
  );
}

function NewGroupForm() {
  const router = useRouter();
  const queryClient = useQueryClient();
  const form = useForm<GroupForm>({ resolver: zodResolver(groupSchema), defaultValues: { name: '', description: '' } });
  const create = useMutation({
    mutationFn: (values: GroupForm) => fetchJson<Wire<GroupSummary>>('/api/groups', { method: 'POST', body: values }),
    onSuccess: async (group) => {
      await queryClient.invalidateQueries({ queryKey: ['groups'] });
      router.push(`/groups/${group.id}`);
    },
    onError: (error) => {
      const field = error instanceof ApiFailure ? error.field : undefined;
      form.setError(field === 'name' || field === 'description' ? field : 'root.server', { message: error.message });
    },
  });
  const { errors } = form.formState;

  return (
    <Section title="Start a group">
      <form onSubmit={form.handleSubmit((v) => create.mutate(v))} noValidate className="flex max-w-xl flex-col gap-4" aria-label="Start a group">
        {errors.root?.server && <Notice kind="error">{errors.root.server.message}</Notice>}
        <TextField id="group-name" label="Group name" error={errors.name?.message} {...form.register('name')} />
        <TextField id="group-description" label="What the group works on (optional)" error={errors.description?.message} {...form.register('description')} />
        <div>
          <Button type="submit" busy={create.isPending}>
            Start the group
          </Button>
        </div>
      </form>
    </Section>
  );
}
