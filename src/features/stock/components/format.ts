const qty = new Intl.NumberFormat(undefined, { maximumFractionDigits: 2 });
const money = new Intl.NumberFormat(undefined, { minimumFractionDigits: 2, maximumFractionDigits: 2 });
export const formatQty = (n: number, unit: string) => `${qty.format(n)} ${unit}`;
export const formatMoney = (n: number) => money.format(n);
