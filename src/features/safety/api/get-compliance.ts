import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { ComplianceSummary } from '../../../../shared/schemas/safety-audit';
import { safetyKeys } from './keys';

export const getComplianceQueryOptions = (days: number) =>
  queryOptions({ queryKey: safetyKeys.compliance(days), queryFn: () => api<ComplianceSummary>('/safety/audit/compliance', { query: { days } }) });
export const useCompliance = (days: number) => useQuery(getComplianceQueryOptions(days));
