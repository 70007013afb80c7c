/**
 * Post-hot-work fire watch end time.
 *
 * Pure module: no I/O, runs on the server and in the browser.
 */

export type FireWatchRuleId = 'osha-1910.252' | 'nfpa-51b-2019';

export interface FireWatchRule {
  readonly id: FireWatchRuleId;
  /** Short name for pickers. */
  readonly label: string;
  /** Minimum fire watch after hot work ends, minutes. */
  readonly fireWatchMinutes: number;
  /** Citation shown on the settings page. */
  readonly source: string;
  /** What the rule requires, in plain words. */
  readonly description: string;
  /**
   * Further monitoring after the fire watch, if the rule has any. It is
   * decided per job (by the permit authorizing individual), so it is shown to
   * the user rather than added to the fire-watch end time.
   */
  readonly followUpMonitoring: null | {
    readonly maxMinutes: number;
    readonly description: string;
  };
}

/**
 * Fire-watch rules a site can pick in settings.
 *
 * - OSHA 29 CFR 1910.252(a)(2)(iii)(B): "A fire watch shall be maintained for
 *   at least a half hour after completion of welding or cutting operations"
 *   ((a)(2)(iii)(A) says when fire watchers are required at all).
 * - NFPA 51B, 2019 edition, 5.6.1.1: fire watch for at least 1 hour after
 *   hot work (the 2014 edition had 30 minutes); 5.6.3: fire monitoring of the
 *   area for up to 3 further hours, as the permit authorizing individual
 *   decides. NFPA text was not available to check; section numbers and
 *   durations are taken from published summaries of the 2019 edition.
 */
export const FIRE_WATCH_RULES: Readonly<Record<FireWatchRuleId, FireWatchRule>> = Object.freeze({
  'osha-1910.252': Object.freeze({
    id: 'osha-1910.252',
    label: 'OSHA 1910.252: 30 minutes',
    fireWatchMinutes: 30,
    source: 'OSHA 29 CFR 1910.252(a)(2)(iii)(B)',
    description: 'Fire watch maintained for at least a half hour after welding or cutting is completed, ' + 'to detect and put out possible smoldering fires.',
    followUpMonitoring: null,
  }),
  'nfpa-51b-2019': Object.freeze({
    id: 'nfpa-51b-2019',
    label: 'NFPA 51B (2019): 1 hour',
    fireWatchMinutes: 60,
    source: 'NFPA 51B, 2019 edition, 5.6.1.1 (fire watch) and 5.6.3 (fire monitoring)',
    description:
      'Fire watch maintained for at least 1 hour after hot work is completed; afterwards the ' +
      'permit authorizing individual may require further fire monitoring of the area.',
    followUpMonitoring: Object.freeze({
      maxMinutes: 180,
      description:
        'Fire monitoring for up to 3 hours after the fire watch ends, as decided by the permit ' + 'authorizing individual for the job; site-defined.',
    }),
  }),
});

/**
 * When the fire watch may end: `endedAt` plus the rule's minimum fire-watch
 * time (OSHA 29 CFR 1910.252(a)(2)(iii)(B): 30 min; NFPA 51B-2019 5.6.1.1:
 * 60 min). Elapsed time is added, so a clock change during the watch does not
 * shorten it. Any follow-up monitoring (NFPA 51B-2019 5.6.3) is not included.
 *
 * Throws for a non-Date or invalid Date, or a rule not in FIRE_WATCH_RULES.
 */
export function fireWatchUntil(endedAt: Date, rule: FireWatchRuleId): Date {
  if (!(endedAt instanceof Date)) {
    throw new Error(`endedAt must be a Date (got ${typeof endedAt})`);
  }
  if (Number.isNaN(endedAt.getTime())) {
    throw new Error('endedAt is an invalid Date');
  }
  if (typeof rule !== 'string' || !Object.prototype.hasOwnProperty.call(FIRE_WATCH_RULES, rule)) {
    throw new Error(`unknown fire-watch rule ${JSON.stringify(rule)}; expected one of ${Object.keys(FIRE_WATCH_RULES).join(', ')}`);
  }
  return new Date(endedAt.getTime() + FIRE_WATCH_RULES[rule].fireWatchMinutes * 60_000);
}
