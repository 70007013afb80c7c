import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { OrgSettingsInput } from '../../../../shared/schemas/organization';
import { queryRoots } from '../../../lib/query-keys';
import { orgSettingsKeys } from './keys';

export type OrganizationSettings = { id: string; name: string; timeZone: string };

export const getOrganizationQueryOptions = () => queryOptions({ queryKey: orgSettingsKeys.all, queryFn: () => api<OrganizationSettings>('/organization') });
export const useOrganization = () => useQuery(getOrganizationQueryOptions());

export function useUpdateOrganization() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (input: OrgSettingsInput) => api<OrganizationSettings>('/organization', { method: 'PATCH', body: input }),
    // The shop's name and zone appear in the header and every date: refresh both.
    onSuccess: () => Promise.all([qc.invalidateQueries({ queryKey: orgSettingsKeys.all }), qc.invalidateQueries({ queryKey: queryRoots.auth })]),
  });
}
