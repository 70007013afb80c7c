import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { baseProperties, orgFilter } from '../common/base';
import { Organization } from '../organizations/organization.entity';
import { User } from '../users/user.entity';
import { Machine } from './machine.entity';

/** A photo on a machine's record (nameplate, wiring, a guard). Kept in the database, checked to be an image. */
export const MachinePhoto = defineEntity({
  name: 'MachinePhoto',
  tableName: 'machine_photo',
  filters: orgFilter,
  indexes: [{ properties: ['machine'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    machine: () => p.manyToOne(Machine).ref(),
    caption: p.string().length(200).nullable(),
    mimeType: p.string().length(40),
    byteSize: p.integer(),
    data: p.blob(),
    uploadedBy: () => p.manyToOne(User).ref().nullable(),
  },
});
export type IMachinePhoto = InferEntity<typeof MachinePhoto>;
