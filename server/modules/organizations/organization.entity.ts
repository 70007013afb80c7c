import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { baseProperties } from '../common/base';
import type { ConsumableSettings } from '../../../shared/domain/consumables';

/** The shop's own reference values for consumables live beside its other settings. */
export type OrgSettings = ConsumableSettings & {
  /** Fire-watch rule after hot work; a site may follow a different local code. */
  fireWatchRule?: 'osha-1910.252' | 'nfpa-51b-2019';
  [key: string]: unknown;
};

export const Organization = defineEntity({
  name: 'Organization',
  tableName: 'organization',
  properties: {
    ...baseProperties,
    name: p.string().length(200),
    slug: p.string().length(80).unique(),
    timeZone: p.string().length(64),
    settings: p.json<OrgSettings>().default('{}'),
  },
});
export type IOrganization = InferEntity<typeof Organization>;
