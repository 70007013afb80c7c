import { queryOptions, useQuery } from '@tanstack/react-query';
import { api, ApiError } from '../../../lib/api-client';
import type { Me } from '../../../../shared/schemas/auth';
import { authKeys } from './keys';

/** The signed-in person, or null when nobody is signed in. */
export async function getMe(): Promise<Me | null> {
  try {
    return await api<Me>('/me');
  } catch (err) {
    if (err instanceof ApiError && err.status === 401) return null;
    throw err;
  }
}

export const getMeQueryOptions = () => queryOptions({ queryKey: authKeys.me(), queryFn: getMe, staleTime: 60_000 });

export const useMe = () => useQuery(getMeQueryOptions());
