const qty = new Intl.NumberFormat(undefined, { maximumFractionDigits: 2 });
const plain = new Intl.NumberFormat(undefined, { minimumFractionDigits: 2, maximumFractionDigits: 2 });

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
export const formatQty = (n: number, unit: string) => `${qty.format(n)} ${unitFor(n, unit)}`;

/** With the shop's currency when its settings name one; otherwise a bare amount the caller labels as a cost. */
export function formatMoney(n: number, currency: string | null = null) {
  if (!currency) return plain.format(n);
  try {
    return new Intl.NumberFormat(undefined, { style: 'currency', currency }).format(n);
  } catch {
    return plain.format(n);
  }
}
