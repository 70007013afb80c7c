import type { EntityManager } from '@mikro-orm/postgresql';
import { LockMode } from '@mikro-orm/core';
import { Organization } from '../organizations/organization.entity';
import type { SafetySettings, SafetySettingsView } from '../../../shared/schemas/safety-records';
import { FIRE_WATCH_RULES } from '../../../shared/domain/hot-work';
import { PLASMA_ARC_CUTTING_SHADES, validateShadeTable, type ShadeTable } from '../../../shared/domain/shade';
import { fieldError } from '../../http/errors';
import { recordActivity } from '../activity-log/activity-log.service';
import type { Principal } from '../../http/principal';

export const DEFAULT_HEARING_SOURCE = 'OSHA 29 CFR 1910.95(c)(1) action level (85 dBA TWA); site rule: wear protectors from there';

export const DEFAULT_SAFETY_SETTINGS: SafetySettings = {
  fireWatchRequired: true,
  fireWatchRule: 'osha-1910.252',
  hearingRequiredFromDbA: 85,
  hearingRuleSource: DEFAULT_HEARING_SOURCE,
  shadeTable: null,
  shiftStarts: ['06:00', '14:00'],
  workDays: ['MO', 'TU', 'WE', 'TH', 'FR'],
  inspectionIntervalMonths: 12,
};

type Stored = { fireWatchRule?: SafetySettings['fireWatchRule']; safety?: Partial<SafetySettings> };

/** The shop's safety settings: stored overrides over the defaults (Organization.settings JSON). */
export function safetySettingsOf(org: { settings: unknown }): SafetySettings {
  const s = (org.settings ?? {}) as Stored;
  return {
    ...DEFAULT_SAFETY_SETTINGS,
    ...(s.safety ?? {}),
    fireWatchRule: s.fireWatchRule ?? s.safety?.fireWatchRule ?? DEFAULT_SAFETY_SETTINGS.fireWatchRule,
  };
}

export async function loadSafetySettings(em: EntityManager, orgId: string): Promise<{ settings: SafetySettings; timeZone: string }> {
  const org = await em.findOneOrFail(Organization, orgId);
  return { settings: safetySettingsOf(org), timeZone: org.timeZone };
}

export function settingsView(settings: SafetySettings): SafetySettingsView {
  return {
    ...settings,
    defaults: {
      shadeSource: PLASMA_ARC_CUTTING_SHADES.source,
      hearingRuleSource: DEFAULT_HEARING_SOURCE,
      fireWatch: Object.values(FIRE_WATCH_RULES).map((r) => ({ id: r.id, label: r.label, source: r.source, description: r.description })),
    },
  };
}

export async function saveSafetySettings(em: EntityManager, who: Principal, input: SafetySettings): Promise<SafetySettings> {
  if (input.shadeTable) {
    try {
      validateShadeTable(input.shadeTable as ShadeTable);
    } catch (err) {
      throw fieldError('shadeTable', `The shade table is not usable: ${err instanceof Error ? err.message : String(err)}`);
    }
  }
  return em.transactional(async (tx) => {
    const org = await tx.findOneOrFail(Organization, who.orgId, { lockMode: LockMode.PESSIMISTIC_WRITE });
    const before = safetySettingsOf(org);
    const { fireWatchRule, ...rest } = input;
    org.settings = { ...(org.settings ?? {}), fireWatchRule, safety: rest };
    recordActivity(tx, who, 'safety.settings-changed', { type: 'Organization', id: org.id }, { before, after: input });
    return safetySettingsOf(org);
  });
}
