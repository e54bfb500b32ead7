'use client';
import { useQuery } from '@tanstack/react-query';
import { fetchJson } from '../../_lib/fetchJson';
import type { GroupView, Wire } from '../../_lib/wire';

export function useGroup(groupId: string) {
  return useQuery({ queryKey: ['group', groupId], queryFn: () => fetchJson<Wire<GroupView>>(`/api/groups/${groupId}`) });
}
