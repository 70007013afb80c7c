/**
 * Which PPE a task needs once the arc current and the day's noise are known. Pure, so the
 * server stores and enforces it and the client previews it while the safety officer types.
 * Shade: OSHA 29 CFR 1910.133(a)(5) via shade.ts (or the site's table); noise: OSHA 29 CFR
 * 1910.95 App. A via noise.ts, with the site's threshold for "hearing protection required".
 */
import { plasmaCuttingShade, PLASMA_ARC_CUTTING_SHADES, type ShadeTable } from '../domain/shade';
import { hearingProtectionRequired, impulsePeakExceeded, IMPULSE_PEAK_LIMIT_DB, noiseVerdicts, protectedExposureDbA, type BasisVerdict } from '../domain/noise';
import { PPE_ITEM_INFO, type HearingResult, type NoiseBasisResult, type PpeItem, type RequiredItem, type ShadeResult } from './safety-ppe';

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

const round1 = (x: number) => Math.round(x * 10) / 10;
const basisResult = (v: BasisVerdict): NoiseBasisResult => ({
  dosePercent: round1(v.dosePercent),
  twaDbA: v.twaDbA === null ? null : round1(v.twaDbA),
  reached: v.reached,
  limitDbA: v.limitDbA,
  label: v.label,
  source: v.source,
});

export type NoiseInput = { noise: { levelDbA: number; hours: number }[]; peakDbC?: number | null; protectorNrr?: number | null };

/**
 * The day's noise at a task: the action-level verdict on the 80–130 dBA dose and the PEL verdict on
 * the 90–140 dBA dose (App. A), the 140 dB peak (1910.95(b)(2)) and the protected exposure from the
 * issued protector's NRR (App. B). Protection is required from the site threshold on the
 * hearing-conservation TWA, over the PEL, or over the peak.
 */
export function deriveHearing(input: NoiseInput | NoiseInput['noise'], settings: DeriveSettings): HearingResult | null {
  const { noise, peakDbC = null, protectorNrr = null } = Array.isArray(input) ? { noise: input } : input;
  if (noise.length === 0 && peakDbC === null) return null;
  const { actionLevel, pel } = noiseVerdicts(noise);
  const twa = actionLevel.twaDbA;
  const status = twa === null ? null : hearingProtectionRequired(twa);
  const peak =
    peakDbC === null ? null : { peakDbC, exceeded: impulsePeakExceeded(peakDbC), limitDb: IMPULSE_PEAK_LIMIT_DB, source: 'OSHA 29 CFR 1910.95(b)(2)' };
  // 0.001 dB slack, as noise.ts does, so a 50 % dose counts as 85 dBA.
  const required = (twa !== null && twa >= settings.hearingRequiredFromDbA - 0.001) || pel.reached || peak?.exceeded === true;
  const band = pel.reached ? 'over-pel' : actionLevel.reached ? 'action-level' : 'below-action-level';
  const protectedTwa =
    protectorNrr === null || pel.twaDbA === null
      ? null
      : {
          nrr: protectorNrr,
          twaDbA: round1(protectedExposureDbA(pel.twaDbA, protectorNrr)),
          deratedTwaDbA: round1(protectedExposureDbA(pel.twaDbA, protectorNrr, { derate: true })),
          source: 'OSHA 29 CFR 1910.95 App. B: TWA − (NRR − 7)',
          deratedSource: 'OSHA Technical Manual Sec. III Ch. 5 field practice: TWA − (NRR − 7) / 2',
        };
  return {
    dosePercent: round1(actionLevel.dosePercent),
    twaDbA: twa === null ? null : round1(twa),
    band,
    description:
      band === 'over-pel'
        ? hearingProtectionRequired(pel.twaDbA as number).description
        : (status?.description ?? 'No exposure at or above 80 dBA: no dose (OSHA 29 CFR 1910.95(d)(2)(i)).'),
    required,
    requiredFromDbA: settings.hearingRequiredFromDbA,
    ruleSource: settings.hearingRuleSource,
    sources: status?.sources ?? ['OSHA 29 CFR 1910.95 App. A'],
    actionLevel: basisResult(actionLevel),
    pel: basisResult(pel),
    peak,
    protected: protectedTwa,
  };
}

/** Listed items plus filter lens (when there is an arc) and hearing protection (when the TWA calls for it). */
export function deriveRequiredItems(
  r: { items: PpeItem[]; otherItems: string[]; arcCurrentA: number | null } & NoiseInput,
  settings: DeriveSettings,
): { shade: ShadeResult | null; hearing: HearingResult | null; required: RequiredItem[] } {
  const shade = deriveShade(r.arcCurrentA, settings.shadeTable);
  const hearing = deriveHearing({ noise: r.noise, peakDbC: r.peakDbC ?? null, protectorNrr: r.protectorNrr ?? null }, settings);
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
        const why = [
          hearing.twaDbA !== null && hearing.twaDbA >= hearing.requiredFromDbA - 0.05
            ? `8-h TWA ${hearing.twaDbA} dBA (dose ${hearing.dosePercent} %, ${hearing.actionLevel.label}) reaches the site threshold of ${hearing.requiredFromDbA} dBA`
            : null,
          hearing.pel.reached ? `over the PEL: TWA ${hearing.pel.twaDbA} dBA (dose ${hearing.pel.dosePercent} %, ${hearing.pel.label})` : null,
          hearing.peak?.exceeded ? `impact peak ${hearing.peak.peakDbC} dB is over ${hearing.peak.limitDb} dB` : null,
        ].filter(Boolean);
        detail = why.join('; ');
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
