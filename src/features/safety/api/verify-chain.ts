import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { ChainVerification } from '../../../../shared/schemas/safety-sign-offs';
import { safetyKeys } from './keys';

/** Runs only when asked (the safety officer presses "Verify the chain"). */
export const getChainQueryOptions = () =>
  queryOptions({ queryKey: safetyKeys.chain(), queryFn: () => api<ChainVerification>('/safety/chain/verify'), staleTime: 0, enabled: false });
export const useChainVerification = () => useQuery(getChainQueryOptions());
