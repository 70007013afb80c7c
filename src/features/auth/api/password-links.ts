import { useMutation } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { TokenPasswordInput } from '../../../../shared/schemas/auth';

export const useRequestReset = () =>
  useMutation({ mutationFn: (input: { email: string }) => api<{ ok: true; message: string }>('/auth/request-reset', { method: 'POST', body: input }) });

export const useRedeemLink = () =>
  useMutation({ mutationFn: (input: TokenPasswordInput) => api<{ ok: true; email: string }>('/auth/redeem', { method: 'POST', body: input }) });
