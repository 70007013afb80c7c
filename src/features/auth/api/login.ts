import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api, setCsrfToken } from '../../../lib/api-client';
import type { LoginInput } from '../../../../shared/schemas/auth';

export async function login(input: LoginInput) {
  const res = await api<{ ok: true; csrfToken: string; role: string }>('/auth/login', { method: 'POST', body: input });
  setCsrfToken(res.csrfToken);
  return res;
}

export function useLogin() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: login, onSuccess: () => qc.resetQueries() });
}
