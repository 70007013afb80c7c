import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { ChainCopyCheck, ChainHeadCopy } from '../../../../shared/schemas/safety-sign-offs';

/** Makes (and records) a signed copy of the chain head, to keep outside Kerfbook. */
export function useDownloadChainCopy() {
  return useMutation({ mutationFn: () => api<ChainHeadCopy>('/safety/chain/copies', { method: 'POST' }) });
}

/** Checks a kept copy (a downloaded file or the block from the daily mail) against the stored chain. */
export function useCheckChainCopy() {
  return useMutation({ mutationFn: (copy: unknown) => api<ChainCopyCheck>('/safety/chain/copies/check', { method: 'POST', body: copy }) });
}
