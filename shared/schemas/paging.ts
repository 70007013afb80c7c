import { z } from 'zod';

/** Page and page size of a list query; the server caps a page at 200 rows. */
export const paging = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(25),
});

/** One page of a list, with the total so the table can offer the other pages. */
export type Page<T> = { rows: T[]; total: number; page: number; pageSize: number };
