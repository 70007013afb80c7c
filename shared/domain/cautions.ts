/**
 * The short caution shown wherever Kerfbook asks someone to work on a machine (screens,
 * PDFs, e-mails). Kerfbook supports a safety programme; it does not replace it.
 * Regulation named as an example: OSHA 29 CFR 1910.147 (control of hazardous energy).
 */
export const WORK_CAUTION =
  'Before you work on a machine, follow your site’s written energy-control (lockout/tagout) procedure and local regulations (for example OSHA 29 CFR 1910.147 in the United States), wear the PPE your site requires, and defer to licensed practice. This record supports your site’s safety programme; it does not replace its procedures, training or the judgement of qualified people.';

export const TORCH_CAUTION =
  'Before opening the torch: switch off and lock out the plasma power source as your site’s procedure and local regulations require, and let the torch cool.';
