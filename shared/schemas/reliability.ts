import { z } from 'zod';
import { isoDate } from './text';
import { failureCodeValue, type DowntimeRow } from './machine-state';
import type { ReliabilityFigures } from '../domain/reliability';

export const MAX_WINDOW_DAYS = 1096;

/** The window is whole days in the shop's zone, "from" and "to" both included; the end is capped at now. */
export const reliabilityQuery = z
  .object({
    from: isoDate('Use a date like 2027-03-01'),
    to: isoDate('Use a date like 2027-03-31'),
    machineId: z.uuid({ message: 'Not a valid machine id' }).optional(),
    failureCode: failureCodeValue.optional(),
  })
  .superRefine((q, ctx) => {
    if (q.to < q.from) ctx.addIssue({ code: 'custom', path: ['to'], message: `"To" must be on or after "From" (${q.from})` });
    else if (Date.parse(q.to) - Date.parse(q.from) > MAX_WINDOW_DAYS * 86_400_000) {
      ctx.addIssue({ code: 'custom', path: ['from'], message: `Choose a window of at most ${MAX_WINDOW_DAYS} days` });
    }
  });
export type ReliabilityQuery = z.output<typeof reliabilityQuery>;

export type ReliabilityMachineRow = { machineId: string; code: string; name: string; figures: ReliabilityFigures };
/** Downtime of one cause in the window (failure stops only), for the Pareto chart. */
export type CauseBar = { code: string | null; label: string; hours: number; stops: number };

export type ReliabilityReport = {
  from: string;
  to: string;
  /** The window actually measured (shop-local days, end capped at now), ISO instants. */
  windowStart: string;
  windowEnd: string;
  failureCode: string | null;
  /** All machines in scope together (sums of operating and down time). */
  figures: ReliabilityFigures;
  machines: ReliabilityMachineRow[];
  byCause: CauseBar[];
  byFailureMode: CauseBar[];
  downtimes: DowntimeRow[];
};
