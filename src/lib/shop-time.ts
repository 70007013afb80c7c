import { useMemo } from 'react';
import { fromShopLocal, toShopLocal } from '../../shared/locale-input';
import { useShopFormat } from './format';

// Wall-clock conversions for datetime-local fields, apart from ./format so that pages without
// such a field (the station) do not load luxon.

/** A datetime-local field's value on the signed-in shop's clock: `const input = useShopInput(); input.toLocalInput(wo.dueAt)`. */
export function useShopInput() {
  const { timeZone } = useShopFormat();
  return useMemo(
    () => ({
      /** An instant as "YYYY-MM-DDTHH:mm" on the shop's clock */
      toLocalInput: (iso: string | null) => toShopLocal(iso, timeZone),
      /** A field's "YYYY-MM-DDTHH:mm" read on the shop's clock, as an ISO instant (null when empty) */
      fromLocalInput: (local: string) => fromShopLocal(local, timeZone),
    }),
    [timeZone],
  );
}
