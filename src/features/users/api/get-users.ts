import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { ListUsersQuery, MemberRow } from '../../../../shared/schemas/users';
import { userKeys } from './keys';
import type { Page } from '../../../../shared/schemas/paging';

export type UsersFilters = Partial<ListUsersQuery> & { page: number; pageSize: number };

export const getUsersQueryOptions = (f: UsersFilters) =>
  queryOptions({ queryKey: userKeys.list(f), queryFn: () => api<Page<MemberRow>>('/users', { query: f }), placeholderData: keepPreviousData });

export const useUsers = (f: UsersFilters) => useQuery(getUsersQueryOptions(f));
