import { z } from 'zod';
import { oneLine } from './text';

/**
 * Why a tag is used alone on an isolation point, OSHA 29 CFR 1910.147(c)(3):
 * (c)(3)(i) the energy isolating device cannot take a lock, so a tagout device is used;
 * (c)(3)(ii) it can take a lock, but the tagout programme gives full employee protection, which
 * (c)(3)(iii) and (c)(5)(ii) tie to an additional safety measure such as removing an isolating
 * circuit element, blocking a controlling switch or opening an extra disconnecting device.
 */
export const TAG_ONLY_BASES = ['cannot-take-lock', 'full-protection'] as const;
export type TagOnlyBasis = (typeof TAG_ONLY_BASES)[number];

export const TAG_ONLY_BASIS_LABELS: Record<TagOnlyBasis, { title: string; source: string }> = {
  'cannot-take-lock': { title: 'The isolating device cannot take a lock', source: '1910.147(c)(3)(i)' },
  'full-protection': { title: 'It can take a lock; tag plus an additional measure gives full protection', source: '1910.147(c)(3)(ii), (c)(3)(iii)' },
};

/** Examples of the additional measure, from 1910.147(c)(3)(iii); shown as hints, the person types their own. */
export const TAG_ONLY_MEASURE_EXAMPLES = [
  'Removal of an isolating circuit element',
  'Blocking of a controlling switch',
  'Opening of an extra disconnecting device',
] as const;

export const TAG_MEASURE_MAX = 300;

/** The two optional fields on a lock point; the server checks them so a refusal is recorded in the safety audit. */
export const tagJustificationFields = {
  tagJustification: z.enum(TAG_ONLY_BASES, { message: 'Choose why a tag is used alone' }).optional(),
  tagMeasure: oneLine(z.string().trim().max(TAG_MEASURE_MAX, `Additional measure: at most ${TAG_MEASURE_MAX} characters`)).optional(),
};

type PointLike = { device: string; tagJustification?: TagOnlyBasis | null; tagMeasure?: string | null };

/** What is missing from the tag-only points' justifications, by field path (empty when all is given). */
export function tagOnlyJustificationIssues(points: PointLike[]): { path: string; message: string }[] {
  const issues: { path: string; message: string }[] = [];
  points.forEach((p, i) => {
    if (p.device !== 'tag-only') return;
    if (!p.tagJustification)
      issues.push({
        path: `points.${i}.tagJustification`,
        message: 'A tag alone needs a reason: the device cannot take a lock (1910.147(c)(3)(i)), or full protection with an additional measure ((c)(3)(ii))',
      });
    else if (p.tagJustification === 'full-protection' && (p.tagMeasure ?? '').trim().length < 5)
      issues.push({
        path: `points.${i}.tagMeasure`,
        message: 'Name the additional safety measure used with the tag, e.g. a circuit element removed (1910.147(c)(3)(iii))',
      });
  });
  return issues;
}

/** One line for summaries, the detail page and the signing dialog. */
export function tagJustificationText(basis: TagOnlyBasis | null | undefined, measure: string | null | undefined): string {
  if (!basis) return '';
  return basis === 'cannot-take-lock'
    ? 'cannot take a lock (1910.147(c)(3)(i))'
    : `full protection with ${(measure ?? '').trim() || 'an additional measure'} (1910.147(c)(3)(ii))`;
}
