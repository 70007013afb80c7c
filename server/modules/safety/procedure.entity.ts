import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { baseProperties, orgFilter } from '../common/base';
import { Organization } from '../organizations/organization.entity';
import { User } from '../users/user.entity';
import { Machine } from '../machines/machine.entity';
import { SafetySignOff } from './sign-off.entity';
import type { ProcedureContent } from '../../../shared/schemas/safety-procedures';

/** An energy-control procedure for one machine; its text lives in numbered versions. */
export const EnergyProcedure = defineEntity({
  name: 'EnergyProcedure',
  tableName: 'safety_procedure',
  filters: orgFilter,
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    machine: () => p.manyToOne(Machine).ref().deleteRule('no action'),
    /** Title of the newest version, kept here for lists. */
    title: p.string().length(160),
  },
});
export type IEnergyProcedure = InferEntity<typeof EnergyProcedure>;

/**
 * One version of a procedure. Only a draft is edited; approval freezes it (and supersedes the
 * previous approved version), so every lockout and training record can name the exact text.
 */
export const ProcedureVersion = defineEntity({
  name: 'ProcedureVersion',
  tableName: 'safety_procedure_version',
  filters: orgFilter,
  uniques: [{ properties: ['procedure', 'version'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    procedure: () => p.manyToOne(EnergyProcedure).ref(),
    version: p.integer(),
    status: p.enum(['draft', 'approved', 'superseded'] as const).default('draft'),
    content: p.json<ProcedureContent>(),
    author: () => p.manyToOne(User).ref(),
    approvedAt: p.datetime().nullable(),
    approvedBy: () => p.manyToOne(User).ref().nullable(),
    approvalSignOff: () => p.manyToOne(SafetySignOff).ref().nullable().deleteRule('no action'),
    retrainingRequired: p.boolean().default(true),
  },
});
export type IProcedureVersion = InferEntity<typeof ProcedureVersion>;

/** Photo of an isolation point, checked by content (file-type), kept with its version. */
export const ProcedurePhoto = defineEntity({
  name: 'ProcedurePhoto',
  tableName: 'safety_procedure_photo',
  filters: orgFilter,
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    version: () => p.manyToOne(ProcedureVersion).ref().deleteRule('cascade'),
    sourceKey: p.string().length(8),
    caption: p.string().length(200).nullable(),
    mime: p.string().length(40),
    size: p.integer(),
    data: p.blob().lazy(true, false),
  },
});
export type IProcedurePhoto = InferEntity<typeof ProcedurePhoto>;
