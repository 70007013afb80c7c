/** What one due-engine pass carries between its steps: the shops it covers, per-shop counts and errors, cached people. */
import type { EntityManager } from '@mikro-orm/postgresql';
import type { Evaluation } from '../../shared/domain/due';
import type { EnginePlanRow } from '../modules/plans/plan-inputs';
import type { MeterBaselines } from '../modules/plans/plan.entity';
import { loadPeople, type Person } from '../modules/work-orders/work-order-mail';
import type { ShopNotices } from '../modules/work-orders/raise-work-orders';

export type OrgStats = {
  plansChecked: number;
  plansEvaluated: number;
  workOrdersRaised: number;
  escalations: number;
  mailsQueued: number;
  errors: { planId?: string; message: string }[];
};
export const emptyStats = (): OrgStats => ({ plansChecked: 0, plansEvaluated: 0, workOrdersRaised: 0, escalations: 0, mailsQueued: 0, errors: [] });

export type Org = { id: string; name: string; time_zone: string };

/** One plan as the pass evaluated it. */
export type Evaluated = {
  row: EnginePlanRow;
  ev: Evaluation;
  /** evaluationHash of this evaluation. */
  hash: string;
  inputsAt: number | null;
  newBaselines: MeterBaselines | null;
  human: (s: string) => string;
};

export const errorText = (err: unknown) => (err instanceof Error ? err.message : String(err));

export class Run {
  readonly stats = new Map<string, OrgStats>();
  private people = new Map<string, Person[]>();
  constructor(
    readonly orgs: Map<string, Org>,
    readonly appUrl: string,
    readonly notify = true,
  ) {}
  of(orgId: string): OrgStats {
    let s = this.stats.get(orgId);
    if (!s) this.stats.set(orgId, (s = emptyStats()));
    return s;
  }
  error(orgId: string, message: string, planId?: string) {
    const s = this.of(orgId);
    if (s.errors.length < 50) s.errors.push({ ...(planId ? { planId } : {}), message: message.slice(0, 500) });
  }
  async peopleOf(em: EntityManager, orgId: string): Promise<Person[]> {
    let p = this.people.get(orgId);
    if (!p) this.people.set(orgId, (p = await loadPeople(em, orgId)));
    return p;
  }
  ctx(orgId: string): ShopNotices {
    const o = this.orgs.get(orgId)!;
    return { orgId, orgName: o.name, timeZone: o.time_zone, appUrl: this.appUrl };
  }
}
