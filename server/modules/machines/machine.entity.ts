import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { baseProperties, orgFilter } from '../common/base';
import { Organization } from '../organizations/organization.entity';
import { MACHINE_KINDS } from '../../../shared/schemas/machines';

/** A machine or one of its components (parent set): the cell, its torch, its punch head … */
export const Machine = defineEntity({
  name: 'Machine',
  tableName: 'machine',
  filters: orgFilter,
  uniques: [{ properties: ['organization', 'code'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    parent: () => p.manyToOne(Machine).ref().nullable(),
    kind: p.enum([...MACHINE_KINDS]),
    /** Short code printed on the QR label and used in CSV imports (e.g. "C1"). */
    code: p.string().length(40),
    name: p.string().length(120),
    location: p.string().length(120).nullable(),
    serial: p.string().length(80).nullable(),
    notes: p.text().nullable(),
    active: p.boolean().default(true),
  },
});
export type IMachine = InferEntity<typeof Machine>;
