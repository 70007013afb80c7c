import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { baseProperties, orgFilter } from '../common/base';
import { Organization } from '../organizations/organization.entity';
import { Machine } from '../machines/machine.entity';
import { User } from '../users/user.entity';
import { WorkOrder } from '../work-orders/work-order.entity';
import type { OilFinding } from '../../../shared/schemas/oil-analysis';

/** What a hydraulic unit's oil should look like: ISO 4406 target code, ISO VG grade, water and temperature limits. */
export const OilTarget = defineEntity({
  name: 'OilTarget',
  tableName: 'oil_target',
  filters: orgFilter,
  uniques: [{ properties: ['organization', 'machine'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    machine: () => p.manyToOne(Machine).ref(),
    targetCode: p.string().length(20),
    vgGrade: p.integer(),
    baselineViscosityCst: p.double().$type<number>().nullable(),
    waterLimitPpm: p.double().$type<number>(),
    temperatureLimitC: p.double().$type<number>().nullable(),
  },
});
export type IOilTarget = InferEntity<typeof OilTarget>;

/** One oil sample result; judged against the unit's target when recorded. */
export const OilAnalysis = defineEntity({
  name: 'OilAnalysis',
  tableName: 'oil_analysis',
  filters: orgFilter,
  indexes: [{ properties: ['machine', 'sampledAt'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    machine: () => p.manyToOne(Machine).ref(),
    sampledAt: p.datetime(),
    labReference: p.string().length(80).nullable(),
    ge4um: p.double().$type<number>(),
    ge6um: p.double().$type<number>(),
    ge14um: p.double().$type<number>(),
    isoCode: p.string().length(20),
    targetCode: p.string().length(20).nullable(),
    viscosity40: p.double().$type<number>().nullable(),
    vgGrade: p.integer().nullable(),
    viscosityBand: p.string().length(20).nullable(),
    waterPpm: p.double().$type<number>().nullable(),
    temperatureC: p.double().$type<number>().nullable(),
    outOfLimits: p.boolean().default(false),
    findings: p.json<OilFinding[]>(),
    workOrder: () => p.manyToOne(WorkOrder).ref().nullable(),
    recordedBy: () => p.manyToOne(User).ref().nullable(),
    notes: p.text().nullable(),
  },
});
export type IOilAnalysis = InferEntity<typeof OilAnalysis>;
