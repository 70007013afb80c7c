import type { InstalledPart } from '../../../../shared/schemas/consumables';

const int = new Intl.NumberFormat(undefined, { maximumFractionDigits: 0 });

/** B10 and the cheapest change point of the part number, from the shop's own records. */
export function ChangePoint({ plan, unit }: { plan: InstalledPart['plan']; unit: string }) {
  if (!plan) return null;
  const c = plan.change;
  return (
    <p className="mt-1 text-sm text-steel-800" data-testid="change-point">
      <span className="font-semibold">
        B10 {int.format(plan.b10)} {unit}
      </span>
      {c.age !== null ? (
        <>
          {' · '}
          <span className="font-semibold">
            cheapest change at {int.format(c.age)} {unit}
          </span>
          {c.savingPercent !== null ? `, ${int.format(c.savingPercent)} % cheaper than running to failure` : ''}
        </>
      ) : c.note ? (
        ` · ${c.note}`
      ) : null}
      {plan.failures < 10 ? ` (from only ${plan.failures} worn-out parts)` : ''}
    </p>
  );
}
