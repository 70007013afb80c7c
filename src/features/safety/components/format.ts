/** A shade-table band for people: "Light (under 300 A)", "Medium (300–400 A)"; stored labels stay as the table has them. */
export function shadeBandLabel(b: { label: string; fromA: number; toA: number }): string {
  const name = b.label.charAt(0).toUpperCase() + b.label.slice(1);
  return `${name} (${b.fromA === 0 ? `under ${b.toA} A` : `${b.fromA}–${b.toA} A`})`;
}
