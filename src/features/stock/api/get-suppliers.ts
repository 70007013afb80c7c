import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { SupplierRow } from '../../../../shared/schemas/purchasing';
import { stockKeys } from './keys';

/** Suppliers a part can name (kept on the purchasing page). */
export const getSuppliers = () => api<SupplierRow[]>('/suppliers');
export const useSupplierOptions = (enabled: boolean) => useQuery({ ...queryOptions({ queryKey: stockKeys.suppliers(), queryFn: getSuppliers }), enabled });
