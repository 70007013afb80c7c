import { useDebounce } from 'use-debounce';

/** How long typing must pause before a search goes to the server: one request per pause, not one per key. */
export const SEARCH_PAUSE_MS = 300;

/** The search text once typing has paused, trimmed; what a list query should be keyed by. */
export function useSettledSearch(text: string): string {
  const [settled] = useDebounce(text.trim(), SEARCH_PAUSE_MS);
  return settled;
}
