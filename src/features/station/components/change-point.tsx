import type { InstalledPart } from '../../../../shared/schemas/consumables';
import { useShopFormat } from '../../../lib/format';

/** B10 and the cheapest change point of the part number, from the shop's own records. */
export function ChangePoint({ plan, unit }: { plan: InstalledPart['plan']; unit: string }) {
  const f = useShopFormat();
  if (!plan) return null;
  const c = plan.change;
  return (
    <p className="mt-1 text-sm text-steel-800" data-testid="change-point">
      <span className="font-semibold">
        B10 {f.number(plan.b10, { max: 0 })} {unit}
      </span>
      {c.age !== null ? (
        <>
          {' · '}
          <span className="font-semibold">
            cheapest change at {f.number(c.age, { max: 0 })} {unit}
          </span>
          {c.savingPercent !== null ? `, ${f.number(c.savingPercent, { max: 0 })} % cheaper than running to failure` : ''}
        </>
      ) : c.note ? (
        ` · ${c.note}`
      ) : null}
      {plan.failures < 10 ? ` (from only ${plan.failures} worn-out parts)` : ''}
    </p>
  );
}
