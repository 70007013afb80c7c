import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { Role } from '../../../../shared/permissions';
import { safetyKeys } from './keys';

export type SafetyPerson = { id: string; name: string; role: Role };

export const getSafetyPeopleQueryOptions = () =>
  queryOptions({ queryKey: safetyKeys.people(), queryFn: () => api<SafetyPerson[]>('/safety/people'), staleTime: 5 * 60_000 });
export const useSafetyPeople = () => useQuery(getSafetyPeopleQueryOptions());
