/**
 * Minimum distance between a light curtain (active opto-electronic protective device, ESPE) and
 * the hazard zone, for a body part approaching at right angles to the detection zone:
 * ISO 13855:2010 "Safety of machinery — Positioning of safeguards with respect to the approach
 * speeds of parts of the human body", the general formula S = K · T + C with C = 8 (d − 14) for a
 * detection capability d ≤ 40 mm (clause 6.2.3, clause number from memory):
 *
 * - K = 2000 mm/s; S at least 100 mm;
 * - where that gives more than 500 mm, K = 1600 mm/s, but S not less than 500 mm.
 *
 * T is the whole system's stopping time: the machine's stopping time plus the curtain's
 * response time (and the safety controller's, if any). A curtain with d > 40 mm detects arms or
 * bodies, not hands, and a different rule of the standard applies; it is refused here.
 * C for d below 14 mm is taken as 0, not negative (from memory: the standard assumes d ≥ 14 mm
 * for finger protection, and a negative intrusion allowance would make no physical sense).
 *
 * Pure module: no I/O, runs on the server and in the browser.
 */

/** Approach speeds, mm/s (ISO 13855:2010). */
export const HAND_SPEED_MM_S = 2000;
export const SLOWER_APPROACH_SPEED_MM_S = 1600;
/** Floors of the distance, mm. */
export const MIN_DISTANCE_MM = 100;
export const MIN_DISTANCE_AT_SLOWER_SPEED_MM = 500;
/** Largest detection capability this formula covers, mm. */
export const MAX_HAND_DETECTION_MM = 40;

export type LightCurtainInput = {
  /** Whole system stopping time T, milliseconds (machine + curtain response + controller). */
  stoppingTimeMs: number;
  /** Detection capability d (the smallest object the curtain always sees, its resolution), mm. */
  detectionCapabilityMm: number;
};

export type LightCurtainDistance = {
  /** Minimum distance S, mm, rounded up to the next whole millimetre. */
  distanceMm: number;
  /** The approach speed K the result used, mm/s. */
  approachSpeedMmS: number;
  /** The intrusion allowance C = 8 (d − 14), mm. */
  intrusionMm: number;
};

/** Thrown for inputs the formula does not cover; `field` names the input. */
export class SafetyDistanceInputError extends RangeError {
  constructor(
    readonly field: keyof LightCurtainInput | 'measuredDistanceMm',
    message: string,
  ) {
    super(message);
  }
}

function positive(value: number, field: keyof LightCurtainInput | 'measuredDistanceMm', what: string): number {
  if (typeof value !== 'number' || !Number.isFinite(value) || value <= 0) {
    throw new SafetyDistanceInputError(field, `${what} must be a number above zero (got ${String(value)})`);
  }
  return value;
}

/** The minimum distance with the speed and allowance it used (ISO 13855:2010, d ≤ 40 mm). */
export function lightCurtainDistance({ stoppingTimeMs, detectionCapabilityMm }: LightCurtainInput): LightCurtainDistance {
  const t = positive(stoppingTimeMs, 'stoppingTimeMs', 'The stopping time') / 1000;
  const d = positive(detectionCapabilityMm, 'detectionCapabilityMm', 'The detection capability');
  if (d > MAX_HAND_DETECTION_MM) {
    throw new SafetyDistanceInputError(
      'detectionCapabilityMm',
      `A detection capability of ${d} mm is above ${MAX_HAND_DETECTION_MM} mm: such a curtain does not detect hands, and ISO 13855 sets its distance by another rule (arm or body approach). Not computed here.`,
    );
  }
  const c = Math.max(0, 8 * (d - 14));
  const atHandSpeed = Math.max(MIN_DISTANCE_MM, HAND_SPEED_MM_S * t + c);
  if (atHandSpeed <= MIN_DISTANCE_AT_SLOWER_SPEED_MM + 1e-6) return { distanceMm: roundUp(atHandSpeed), approachSpeedMmS: HAND_SPEED_MM_S, intrusionMm: c };
  const atSlowerSpeed = Math.max(MIN_DISTANCE_AT_SLOWER_SPEED_MM, SLOWER_APPROACH_SPEED_MM_S * t + c);
  return { distanceMm: roundUp(atSlowerSpeed), approachSpeedMmS: SLOWER_APPROACH_SPEED_MM_S, intrusionMm: c };
}

/** Rounded up, never down: a distance is a minimum. Float noise below a micrometre is ignored. */
const roundUp = (mm: number) => Math.ceil(mm - 1e-6);

/** Minimum safety distance S in mm for a light curtain with d ≤ 40 mm (ISO 13855:2010). */
export function lightCurtainMinDistanceMm(input: LightCurtainInput): number {
  return lightCurtainDistance(input).distanceMm;
}

export type LightCurtainCheckResult = LightCurtainDistance & { measuredDistanceMm: number; marginMm: number; pass: boolean };

/** The periodic check: the mounting distance measured on the machine must be at least S. */
export function checkLightCurtain(input: LightCurtainInput & { measuredDistanceMm: number }): LightCurtainCheckResult {
  const measured = positive(input.measuredDistanceMm, 'measuredDistanceMm', 'The measured mounting distance');
  const s = lightCurtainDistance(input);
  return { ...s, measuredDistanceMm: measured, marginMm: Math.round((measured - s.distanceMm) * 10) / 10, pass: measured >= s.distanceMm };
}
