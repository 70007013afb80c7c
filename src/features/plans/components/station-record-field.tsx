import { Controller, type Control } from 'react-hook-form';
import type { z } from 'zod';
import { STATION_RECORD_KINDS, STATION_RECORD_LABELS, type planInput, type StationRecordRule } from '../../../../shared/schemas/plans';
import { PART_CATEGORY_LABELS, TORCH_CATEGORIES } from '../../../../shared/schemas/stock';
import { SelectField } from '../../../components/ui/field';

type In = z.input<typeof planInput>;

const blankRule = (kind: StationRecordRule['kind']): StationRecordRule => {
  switch (kind) {
    case 'consumable-change':
      return { kind, categories: ['electrode', 'nozzle'] };
    case 'counter-reading':
      return { kind, meterId: '' };
    default:
      return { kind };
  }
};

/**
 * Which record made at the station does this plan's work, so the operator's entry signs off the
 * work order instead of being typed in twice.
 */
export function StationRecordField({
  control,
  meters,
  errors,
}: {
  control: Control<In>;
  meters: { id: string; name: string; unit: string; kind: string }[];
  errors: { kind?: string; categories?: string; meterId?: string };
}) {
  return (
    <Controller
      control={control}
      name="stationRecord"
      render={({ field }) => {
        const rule = (field.value ?? null) as StationRecordRule | null;
        return (
          <fieldset className="space-y-2 md:col-span-2" aria-describedby="station-record-hint">
            <legend className="text-sm font-semibold">Done at the station by</legend>
            <p id="station-record-hint" className="text-sm text-steel-700">
              When this is recorded at the machine, the plan’s open work order is signed off by that person at that moment and the plan counts from it.
            </p>
            <SelectField
              label="Station record"
              error={errors.kind}
              value={rule?.kind ?? ''}
              onChange={(e) => field.onChange(e.target.value ? blankRule(e.target.value as StationRecordRule['kind']) : null)}
              options={[
                { value: '', label: 'Nothing: only a signed-off work order' },
                ...STATION_RECORD_KINDS.map((k) => ({ value: k, label: STATION_RECORD_LABELS[k] })),
              ]}
            />
            {rule?.kind === 'consumable-change' ? (
              <div role="group" aria-label="Parts whose change does this work">
                <p className="text-sm font-semibold">Parts that must all be in the change</p>
                <div className="flex flex-wrap gap-x-4">
                  {TORCH_CATEGORIES.map((c) => (
                    <label key={c} className="flex min-h-touch items-center gap-2">
                      <input
                        type="checkbox"
                        className="h-6 w-6"
                        checked={rule.categories.includes(c)}
                        onChange={(e) =>
                          field.onChange({
                            ...rule,
                            categories: e.target.checked
                              ? TORCH_CATEGORIES.filter((x) => x === c || rule.categories.includes(x))
                              : rule.categories.filter((x) => x !== c),
                          })
                        }
                      />
                      {PART_CATEGORY_LABELS[c]}
                    </label>
                  ))}
                </div>
                {errors.categories ? (
                  <p className="text-sm font-semibold text-danger" role="alert">
                    {errors.categories}
                  </p>
                ) : null}
              </div>
            ) : null}
            {rule?.kind === 'counter-reading' ? (
              <SelectField
                label="Counter"
                error={errors.meterId}
                value={rule.meterId}
                onChange={(e) => field.onChange({ ...rule, meterId: e.target.value })}
                options={[
                  { value: '', label: 'Choose…' },
                  ...meters.filter((m) => m.kind !== 'condition').map((m) => ({ value: m.id, label: `${m.name} (${m.unit})` })),
                ]}
              />
            ) : null}
          </fieldset>
        );
      }}
    />
  );
}
