// Dates come from the one shop-time formatter; this file keeps the feature's own input style.
export { formatWhen, relative } from '../../../lib/format';
export { toShopLocal, fromShopLocal } from '../../../lib/shop-time';

export const inputClass = 'block w-full min-h-touch rounded border border-steel-400 bg-white px-3 py-2 text-base';
