import { defineEntity, p, type InferEntity } from '@mikro-orm/core';
import { baseProperties, orgFilter } from '../common/base';
import { Organization } from '../organizations/organization.entity';
import { Machine } from '../machines/machine.entity';
import { Meter } from '../meters/meter.entity';
import { User } from '../users/user.entity';
import { STATION_SIZES } from '../../../shared/schemas/punch-tools';

/** A punch (with its die) in the turret: hits since its last sharpening come from a hits meter. */
export const PunchTool = defineEntity({
  name: 'PunchTool',
  tableName: 'punch_tool',
  filters: orgFilter,
  uniques: [{ properties: ['organization', 'code'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    machine: () => p.manyToOne(Machine).ref(),
    hitsMeter: () => p.manyToOne(Meter).ref(),
    code: p.string().length(40),
    name: p.string().length(120),
    stationSize: p.enum([...STATION_SIZES]),
    sharpeningIntervalHits: p.integer(),
    /** Hits meter value at the last sharpening (or when the tool was entered). */
    hitsAtLastSharpening: p.double().$type<number>(),
    lastSharpenedAt: p.datetime().nullable(),
    active: p.boolean().default(true),
  },
});
export type IPunchTool = InferEntity<typeof PunchTool>;

export const ToolSharpening = defineEntity({
  name: 'ToolSharpening',
  tableName: 'tool_sharpening',
  filters: orgFilter,
  indexes: [{ properties: ['tool', 'sharpenedAt'] }],
  properties: {
    ...baseProperties,
    organization: () => p.manyToOne(Organization).ref(),
    tool: () => p.manyToOne(PunchTool).ref(),
    sharpenedAt: p.datetime(),
    hitsReading: p.double().$type<number>(),
    /** Hits since the sharpening before, i.e. the run this sharpening ends. */
    hitsSincePrevious: p.double().$type<number>(),
    removedMm: p.double().$type<number>().nullable(),
    by: () => p.manyToOne(User).ref().nullable(),
    note: p.string().length(300).nullable(),
  },
});
export type IToolSharpening = InferEntity<typeof ToolSharpening>;
