/** What a lockout refuses while its devices are off for testing or positioning, or back on but not yet re-verified. */
import { conflict } from '../../http/errors';
import type { LockoutState } from '../../../shared/schemas/safety-lockout';

/**
 * While the devices are off (state `testing`) nothing but reapplying them is allowed; once they are
 * back on (`reapplied`) work resumes only after isolation is verified again (1910.147(f)(1)(v), (d)(6)).
 * `allowReapplied` is for actions that do not resume work, like releasing the lockout.
 */
export function refuseDuringTestWindow(s: { state: LockoutState }, doing: string, allowReapplied = false): void {
  if (s.state === 'testing')
    throw conflict(`The devices are off for testing or positioning: put them back on and verify isolation before you ${doing}`, [
      { path: 'state', message: 'Energized for testing — locks off' },
    ]);
  if (s.state === 'reapplied' && !allowReapplied)
    throw conflict(`The devices are back on after testing but isolation is not verified again yet: verify it before you ${doing}`, [
      { path: 'state', message: 'Re-verify isolation after testing first' },
    ]);
}
