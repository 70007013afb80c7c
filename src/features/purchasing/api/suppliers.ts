import { queryOptions, useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import type { z } from 'zod';
import { api } from '../../../lib/api-client';
import type { SupplierRow, supplierInputSchema } from '../../../../shared/schemas/purchasing';
import { purchasingKeys } from './keys';

export const getSuppliers = () => api<SupplierRow[]>('/suppliers');
export const getSuppliersQueryOptions = () => queryOptions({ queryKey: purchasingKeys.suppliers(), queryFn: getSuppliers });
export const useSuppliers = () => useQuery(getSuppliersQueryOptions());

export const createSupplier = (input: z.input<typeof supplierInputSchema>) => api<{ id: string }>('/suppliers', { method: 'POST', body: input });
export function useCreateSupplier() {
  const qc = useQueryClient();
  return useMutation({ mutationFn: createSupplier, onSuccess: () => qc.invalidateQueries({ queryKey: purchasingKeys.suppliers() }) });
}
