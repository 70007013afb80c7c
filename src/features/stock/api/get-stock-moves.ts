import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { StockMoveRow } from '../../../../shared/schemas/stock';
import { stockKeys } from './keys';
import type { Page } from '../../../../shared/schemas/paging';

export const getStockMoves = (partTypeId: string, page: number, pageSize: number) =>
  api<Page<StockMoveRow>>(`/part-types/${partTypeId}/moves`, { query: { page, pageSize } });

export const getStockMovesQueryOptions = (partTypeId: string, page = 1, pageSize = 25) =>
  queryOptions({
    queryKey: stockKeys.moves(partTypeId, page, pageSize),
    queryFn: () => getStockMoves(partTypeId, page, pageSize),
    placeholderData: keepPreviousData,
  });

export const useStockMoves = (partTypeId: string, page = 1, pageSize = 25) => useQuery(getStockMovesQueryOptions(partTypeId, page, pageSize));
