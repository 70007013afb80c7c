import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { HydraulicUnitView } from '../../../../shared/schemas/oil-analysis';
import { oilAnalysisKeys } from './keys';

export const getOilUnits = () => api<{ units: HydraulicUnitView[] }>('/oil-units');

export const getOilUnitsQueryOptions = () => queryOptions({ queryKey: oilAnalysisKeys.units(), queryFn: getOilUnits });

export const useOilUnits = () => useQuery(getOilUnitsQueryOptions());
