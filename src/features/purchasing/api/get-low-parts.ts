import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { PartTypeRow } from '../../../../shared/schemas/stock';
import { purchasingKeys } from './keys';

/** Parts whose stock on hand plus on order is at or below the reorder point. */
export const getLowParts = () => api<PartTypeRow[]>('/part-types', { query: { lowOnly: 'true' } });
export const getLowPartsQueryOptions = () => queryOptions({ queryKey: purchasingKeys.lowParts(), queryFn: getLowParts });
export const useLowParts = () => useQuery(getLowPartsQueryOptions());
