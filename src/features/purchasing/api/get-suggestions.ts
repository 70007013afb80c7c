import { keepPreviousData, queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import type { SuggestedOrderRow } from '../../../../shared/schemas/purchasing';
import { purchasingKeys } from './keys';

export const getSuggestions = (weeks: number) => api<SuggestedOrderRow[]>('/purchasing/suggestions', { query: { weeks } });
export const getSuggestionsQueryOptions = (weeks: number) =>
  queryOptions({ queryKey: purchasingKeys.suggestions(weeks), queryFn: () => getSuggestions(weeks), placeholderData: keepPreviousData });
export const useSuggestions = (weeks: number) => useQuery(getSuggestionsQueryOptions(weeks));
export const suggestionsCsvHref = (weeks: number) => `/api/purchasing/suggestions.csv?weeks=${weeks}`;
