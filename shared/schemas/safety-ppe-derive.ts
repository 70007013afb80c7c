/**
 * Which PPE a task needs once the arc current and the day's noise are known. Pure, so the
 * server stores and enforces it and the client previews it while the safety officer types.
 * Shade: OSHA 29 CFR 1910.133(a)(5) via shade.ts (or the site's table); noise: OSHA 29 CFR
 * 1910.95 App. A via noise.ts, with the site's threshold for "hearing protection required".
 */
import { plasmaCuttingShade, PLASMA_ARC_CUTTING_SHADES, type ShadeTable } from '../domain/shade';
import { hearingProtectionRequired, noiseDosePercent, twaFromDose } from '../domain/noise';
import { PPE_ITEM_INFO, type HearingResult, type PpeItem, type RequiredItem, type ShadeResult } from './safety-ppe';

export type DeriveSettings = { shadeTable: ShadeTable | null; hearingRequiredFromDbA: number; hearingRuleSource: string };

export function deriveShade(arcCurrentA: number | null, table: ShadeTable | null): ShadeResult | null {
  if (arcCurrentA === null) return null;
  const t = table ?? PLASMA_ARC_CUTTING_SHADES;
  try {
    const s = plasmaCuttingShade(arcCurrentA, t);
    return {
      ok: true,
      arcCurrentA,
      minimum: s.minimum,
      suggested: s.suggested,
      band: s.band,
      source: s.source,
      notes: [...t.notes],
      siteOverride: table !== null,
    };
  } catch (err) {
    return { ok: false, arcCurrentA, message: err instanceof Error ? err.message : String(err), source: t.source };
  }
}

export function deriveHearing(noise: { levelDbA: number; hours: number }[], settings: DeriveSettings): HearingResult | null {
  if (noise.length === 0) return null;
  const dose = noiseDosePercent(noise);
  const twa = dose > 0 ? twaFromDose(dose) : null;
  const status = twa === null ? null : hearingProtectionRequired(twa);
  // 0.001 dB slack, as noise.ts does, so a 50 % dose counts as 85 dBA.
  const required = twa !== null && twa >= settings.hearingRequiredFromDbA - 0.001;
  return {
    dosePercent: Math.round(dose * 10) / 10,
    twaDbA: twa === null ? null : Math.round(twa * 10) / 10,
    band: status?.band ?? 'below-action-level',
    description: status?.description ?? 'No exposure at or above 80 dBA: no dose (OSHA 29 CFR 1910.95(d)(2)(i)).',
    required,
    requiredFromDbA: settings.hearingRequiredFromDbA,
    ruleSource: settings.hearingRuleSource,
    sources: status?.sources ?? ['OSHA 29 CFR 1910.95 App. A'],
  };
}

/** Listed items plus filter lens (when there is an arc) and hearing protection (when the TWA calls for it). */
export function deriveRequiredItems(
  r: { items: PpeItem[]; otherItems: string[]; arcCurrentA: number | null; noise: { levelDbA: number; hours: number }[] },
  settings: DeriveSettings,
): { shade: ShadeResult | null; hearing: HearingResult | null; required: RequiredItem[] } {
  const shade = deriveShade(r.arcCurrentA, settings.shadeTable);
  const hearing = deriveHearing(r.noise, settings);
  const codes = new Set<PpeItem>(r.items);
  if (shade) codes.add('filter-lens');
  if (hearing?.required) codes.add('hearing-protection');
  const order = Object.keys(PPE_ITEM_INFO) as PpeItem[];
  const required: RequiredItem[] = order
    .filter((c) => codes.has(c))
    .map((code) => {
      let detail: string | null = null;
      if (code === 'filter-lens' && shade) {
        detail = shade.ok
          ? `Shade ${shade.minimum} or darker at ${shade.arcCurrentA} A (suggested ${shade.suggested})`
          : `No published shade for ${shade.arcCurrentA} A: ask the lens or torch maker`;
      }
      if (code === 'hearing-protection' && hearing?.required) {
        detail = `8-h TWA ${hearing.twaDbA} dBA (dose ${hearing.dosePercent} %) reaches the site threshold of ${hearing.requiredFromDbA} dBA`;
      }
      const source =
        code === 'filter-lens' && shade
          ? shade.source
          : code === 'hearing-protection' && hearing
            ? `${hearing.ruleSource}; ${PPE_ITEM_INFO[code].source}`
            : PPE_ITEM_INFO[code].source;
      return { code, label: PPE_ITEM_INFO[code].label, source, detail };
    });
  for (const label of r.otherItems) required.push({ code: `other:${label}`, label, source: 'Site rule', detail: null });
  return { shade, hearing, required };
}
