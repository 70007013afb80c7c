import { paging } from './paging';

export const listJobRunsQuery = paging;

export type JobRunRow = {
  id: string;
  passId: string;
  trigger: 'schedule' | 'manual';
  triggeredBy: string | null;
  startedAt: string;
  finishedAt: string | null;
  plansChecked: number;
  plansEvaluated: number;
  workOrdersRaised: number;
  escalations: number;
  mailsQueued: number;
  errors: { planId?: string; message: string }[];
};

export type RunNowResult = { ran: boolean; message: string; run: JobRunRow | null };
