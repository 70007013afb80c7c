import { WORK_CAUTION } from '../../../shared/domain/cautions';
import { Notice } from './notice';

/** Shown wherever the product asks someone to work on a machine. */
export function WorkCaution({ text = WORK_CAUTION }: { text?: string }) {
  return (
    <Notice tone="caution" title="Safety first" role="note">
      {text}
    </Notice>
  );
}
