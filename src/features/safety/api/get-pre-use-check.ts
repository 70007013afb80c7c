import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { PreUseCheckView } from '../../../../shared/schemas/pre-use-checks';
import { safetyKeys } from './keys';

export const getPreUseCheckQueryOptions = (code: string) =>
  queryOptions({ queryKey: safetyKeys.preUse(code), queryFn: () => api<PreUseCheckView>(`/machines/${encodeURIComponent(code)}/pre-use-checks`) });
export const usePreUseCheck = (code: string) => useQuery(getPreUseCheckQueryOptions(code));
