'use client';
import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { ColumnDef } from '@tanstack/react-table';
import { useMemo, useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { DataTable } from '@/components/DataTable';
import { Button, Loading, Notice, Section, SelectField, TextField, When } from '@/components/ui';
import { ApiFailure, fetchJson } from '../../../_lib/fetchJson';
import { inviteSchema, roleValues } from '../../../_lib/schemas';
import type { MemberView, PendingInvitationView, Role, Wire } from '../../../_lib/wire';
import { GroupHeader } from '../GroupHeader';
import { useGroup } from '../useGroup';

type Member = Wire<MemberView>;
type Invitation = Wire<PendingInvitationView>;
type InviteForm = z.input<typeof inviteSchema>;

const roleOptions = roleValues.map((role) => ({ value: role, label: role }));

const roleMeaning: Record<Role, string> = {
  lead: 'everything an author may, plus members, locks and share links',
  author: 'writes derivations, saves versions, uploads data',
  reviewer: 'reads, runs checks, leaves remarks, signs off steps',
  reader: 'reads and follows plots; writes nothing',
};

export function MembersPage({ groupId, userId }: { groupId: string; userId: string }) {
  const group = useGroup(groupId);
  const may = new Set(group.data?.actions ?? []);
  const members = useQuery({
    queryKey: ['members', groupId],
    queryFn: () => fetchJson<{ members: Member[] }>(`/api/groups/${groupId}/members`),
    enabled: group.isSuccess,
  });
  const canChange = may.has('changeRole');
  const canRemove = may.has('removeMember');

  const columns = useMemo<ColumnDef<Member, unknown>[]>(
    () => [
      { id: 'name', header: 'Name', accessorFn: (m) => m.name, cell: ({ row }) => <span>{row.original.name}{row.original.userId === userId && <span className="text-ink-faint"> (you)</span>}</span> },
      { id: 'email', header: 'E-mail', accessorFn: (m) => m.email, cell: ({ getValue }) => <span className="text-ink-soft">{String(getValue())}</span> },
      {
        id: 'role',
        header: 'Role',
        accessorFn: (m) => roleValues.indexOf(m.role),
        enableGlobalFilter: false,
        cell: ({ row }) => (canChange ? <RoleCell groupId={groupId} member={row.original} /> : <span>{row.original.role}</span>),
      },
      { id: 'joinedAt', header: 'Joined', accessorFn: (m) => m.joinedAt, enableGlobalFilter: false, cell: ({ row }) => <span className="text-ink-soft"><When iso={row.original.joinedAt} /></span> },
      ...(canRemove
        ? [{ id: 'remove', header: '', enableSorting: false, cell: ({ row }) => <RemoveCell groupId={groupId} member={row.original} /> } satisfies ColumnDef<Member, unknown>]
        : []),
    ],
    [groupId, userId, canChange, canRemove],
  );

  return (
    <div>
      <GroupHeader groupId={groupId} current="members" />
      {members.isPending && group.isSuccess && <Loading what="members" />}
      {members.error && <Notice kind="error">{members.error.message}</Notice>}
      {members.data && (
        <DataTable caption="Members of this group" data={members.data.members} columns={columns} rowId={(m) => m.userId} filterPlaceholder="name or e-mail" empty="No members." />
      )}
      <dl className="mt-4 grid max-w-3xl grid-cols-[7rem_1fr] gap-x-4 gap-y-1 text-sm text-ink-soft">
        {roleValues.map((role) => (
          <div key={role} className="contents">
            <dt className="font-semibold">{role}</dt>
            <dd>{roleMeaning[role]}</dd>
          </div>
        ))}
      </dl>
      {may.has('invite') && <Invitations groupId={groupId} />}
    </div>
  );
}

function RoleCell({ groupId, member }: { groupId: string; member: Member }) {
  const queryClient = useQueryClient();
  const change = useMutation({
    mutationFn: (role: Role) => fetchJson<{ members: Member[] }>(`/api/groups/${groupId}/members/${member.userId}`, { method: 'PATCH', body: { role } }),
    onSuccess: (data) => {
      queryClient.setQueryData(['members', groupId], data);
      return queryClient.invalidateQueries({ queryKey: ['group', groupId] });
    },
  });
  return (
    <div>
      <SelectField
        id={`role-${member.userId}`}
        label={`Role of ${member.name}`}
        className="w-36 py-1"
        value={member.role}
        disabled={change.isPending}
        options={roleOptions}
        onChange={(e) => change.mutate(e.target.value as Role)}
      />
      {change.error && <p role="alert" className="mt-1 max-w-xs text-sm text-verdict-fails">{change.error.message}</p>}
    </div>
  );
}

function RemoveCell({ groupId, member }: { groupId: string; member: Member }) {
  const [confirming, setConfirming] = useState(false);
  const queryClient = useQueryClient();
  const remove = useMutation({
    mutationFn: () => fetchJson<{ members: Member[] }>(`/api/groups/${groupId}/members/${member.userId}`, { method: 'DELETE' }),
    onSuccess: (data) => queryClient.setQueryData(['members', groupId], data),
  });
  if (!confirming) {
    return (
      <button type="button" className="rounded text-sm text-ink-faint hover:text-verdict-fails" onClick={() => setConfirming(true)}>
        Remove
      </button>
    );
  }
  return (
    <div className="flex flex-wrap items-center gap-2 text-sm" role="group" aria-label={`Confirm removing ${member.name}`}>
      <Button kind="danger" busy={remove.isPending} onClick={() => remove.mutate()}>
        Remove {member.name}
      </Button>
      <Button kind="quiet" onClick={() => setConfirming(false)}>
        Keep
      </Button>
      {remove.error && <span role="alert" className="text-verdict-fails">{remove.error.message}</span>}
    </div>
  );
}

function Invitations({ groupId }: { groupId: string }) {
  const queryClient = useQueryClient();
  const key = ['invitations', groupId];
  const pending = useQuery({ queryKey: key, queryFn: () => fetchJson<{ invitations: Invitation[] }>(`/api/groups/${groupId}/invitations`) });
  const form = useForm<InviteForm>({ resolver: zodResolver(inviteSchema), defaultValues: { email: '', role: 'author' } });
  const [sentTo, setSentTo] = useState<string | null>(null);
  const invite = useMutation({
    mutationFn: (values: InviteForm) => fetchJson<Invitation>(`/api/groups/${groupId}/invitations`, { method: 'POST', body: values }),
    onSuccess: async (invitation) => {
      setSentTo(invitation.email);
      form.reset({ email: '', role: form.getValues('role') });
      await queryClient.invalidateQueries({ queryKey: key });
    },
    onError: (error) => {
      const field = error instanceof ApiFailure ? error.field : undefined;
      form.setError(field === 'email' || field === 'role' ? field : 'root.server', { message: error.message });
    },
  });
  const withdraw = useMutation({
    mutationFn: (id: string) => fetchJson(`/api/groups/${groupId}/invitations/${id}`, { method: 'DELETE' }),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: key }),
  });
  const { errors } = form.formState;

  return (
    <Section title="Invite a member">
      <form onSubmit={form.handleSubmit((v) => invite.mutate(v))} noValidate className="flex max-w-xl flex-col gap-3" aria-label="Invite a member">
        {errors.root?.server && <Notice kind="error">{errors.root.server.message}</Notice>}
        <div className="grid grid-cols-[1fr_10rem] gap-3">
          <TextField id="invite-email" label="E-mail" type="email" error={errors.email?.message} {...form.register('email')} />
          <SelectField id="invite-role" label="Role" options={roleOptions} error={errors.role?.message} {...form.register('role')} />
        </div>
        <div>
          <Button type="submit" busy={invite.isPending}>
            Send invitation
          </Button>
        </div>
        {sentTo && <Notice kind="done">Invitation sent to {sentTo}.</Notice>}
      </form>
      <h3 className="mt-6 text-lg">Pending invitations</h3>
      {pending.isPending && <Loading what="invitations" />}
      {pending.data && pending.data.invitations.length === 0 && <p className="text-ink-faint">None.</p>}
      {pending.data && pending.data.invitations.length > 0 && (
        <ul className="mt-2 divide-y divide-rule border-y border-rule" aria-label="Pending invitations">
          {pending.data.invitations.map((inv) => (
            <li key={inv.id} className="flex flex-wrap items-baseline gap-x-4 py-2">
              <span>{inv.email}</span>
              <span className="text-ink-soft">as {inv.role}</span>
              <span className="text-sm text-ink-faint">
                expires <When iso={inv.expiresAt} />
              </span>
              <span className="flex-1" />
              <button type="button" className="rounded text-sm text-ink-faint hover:text-verdict-fails" onClick={() => withdraw.mutate(inv.id)}>
                Withdraw
              </button>
            </li>
          ))}
        </ul>
      )}
      {withdraw.error && <Notice kind="error">{withdraw.error.message}</Notice>}
    </Section>
  );
}
