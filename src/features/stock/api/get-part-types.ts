import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { PartTypeRow } from '../../../../shared/schemas/stock';
import { stockKeys } from './keys';

export type PartTypesFilters = { lowOnly?: boolean; includeInactive?: boolean };

export const getPartTypes = (f: PartTypesFilters) =>
  api<PartTypeRow[]>('/part-types', { query: { lowOnly: f.lowOnly ? 'true' : undefined, includeInactive: f.includeInactive ? 'true' : undefined } });

export const getPartTypesQueryOptions = (f: PartTypesFilters = {}) => queryOptions({ queryKey: stockKeys.partTypes(f), queryFn: () => getPartTypes(f) });

export const usePartTypes = (f: PartTypesFilters = {}) => useQuery(getPartTypesQueryOptions(f));
