import { createContext, createElement, useContext, useMemo, type ReactNode } from 'react';
import {
  DEFAULT_SHOP_LOCALE,
  formatDate,
  formatDateTime,
  formatDay,
  formatMoney,
  formatNumber,
  formatRelative,
  formatTime,
  todayIn,
  type Instant,
  type NumberStyle,
  type ShopClock,
} from '../../shared/locale';

// Stock units are stored in the plural; one of them reads in the singular.
const SINGULAR: Record<string, string> = {
  pcs: 'pc',
  sets: 'set',
  boxes: 'box',
  rolls: 'roll',
  pairs: 'pair',
  packs: 'pack',
  litres: 'litre',
  cartridges: 'cartridge',
};
export const unitFor = (n: number, unit: string) => (Math.abs(n) === 1 ? (SINGULAR[unit] ?? unit) : unit);

/**
 * Every way the client shows a time or a number, bound to one shop's zone and locale (rules in
 * shared/locale.ts). Intl only, so every page can show times without luxon; datetime-local
 * fields read and write through `useShopInput()` (./shop-time).
 */
export function shopFormat(shop: ShopClock) {
  return {
    timeZone: shop.timeZone,
    locale: shop.locale,
    /** "5 Dec 2026" */
    date: (at: Instant | null | undefined) => formatDate(at, shop),
    /** "5 Dec 2026, 14:30" */
    dateTime: (at: Instant | null | undefined, opts?: { weekday?: boolean; seconds?: boolean }) => formatDateTime(at, shop, opts),
    /** "14:30" */
    time: (at: Instant | null | undefined) => formatTime(at, shop),
    /** "5 Dec", for chart axes */
    day: (at: Instant) => formatDay(at, shop),
    /** "in 3 days", "2 hours ago" */
    relative: (iso: string | null | undefined) => formatRelative(iso, shop.locale),
    /** Today's date (YYYY-MM-DD) on the shop's clock */
    today: () => todayIn(shop.timeZone),
    /** "12,345.6" (at most one decimal unless told) */
    number: (n: number, style?: NumberStyle) => formatNumber(n, shop.locale, style),
    /** "3 pcs", "1 pc" */
    qty: (n: number, unit: string) => `${formatNumber(n, shop.locale, { max: 2 })} ${unitFor(n, unit)}`,
    money: (n: number, currency: string | null = null) => formatMoney(n, shop.locale, currency),
  };
}
export type ShopFormat = ReturnType<typeof shopFormat>;

// Before sign-in (and in isolated component tests) there is no shop: the viewer's zone and the default locale.
const fallback = shopFormat({ timeZone: Intl.DateTimeFormat().resolvedOptions().timeZone, locale: DEFAULT_SHOP_LOCALE });
const ShopFormatContext = createContext<ShopFormat>(fallback);

/** Given once by the signed-in layout, from the principal's shop (`/api/me`). */
export function ShopFormatProvider({ timeZone, locale, children }: { timeZone: string; locale?: string; children: ReactNode }) {
  const value = useMemo(() => shopFormat({ timeZone, locale: locale ?? DEFAULT_SHOP_LOCALE }), [timeZone, locale]);
  return createElement(ShopFormatContext.Provider, { value }, children);
}

/** The signed-in shop's formatter: `const f = useShopFormat(); f.dateTime(row.at)`. */
export const useShopFormat = (): ShopFormat => useContext(ShopFormatContext);

/** A moment on the shop's clock, for table cells and texts defined outside a component. */
export function ShopTime({ at, dateOnly = false }: { at: Instant | null | undefined; dateOnly?: boolean }) {
  const f = useShopFormat();
  return dateOnly ? f.date(at) : f.dateTime(at);
}
