import { REMOVAL_REASON_LABELS, type RemovalReason } from '../../../../shared/schemas/consumables';
import { PART_CATEGORY_LABELS, type TorchCategory } from '../../../../shared/schemas/stock';

const chip = 'min-h-touch rounded border-2 px-3 py-1 font-semibold';
const on = 'border-steel-900 bg-steel-900 text-white';
const off = 'border-steel-400 bg-white text-steel-900';
const COMMON: RemovalReason[] = ['worn', 'failed-start', 'poor-cut', 'damaged', 'preventive'];
const PROCESS: RemovalReason[] = ['gas-pressure', 'moisture', 'torch-height'];

/**
 * Why each part came out, one row per part, with the usual answer already chosen (the part
 * the change was made for is worn, the others came out with it). Process faults sit in a list
 * of their own: they are not the part's wear.
 */
export function ReasonPicker({
  categories,
  reasons,
  errors,
  onPick,
}: {
  categories: TorchCategory[];
  reasons: Partial<Record<TorchCategory, RemovalReason>>;
  errors?: Partial<Record<TorchCategory, { message?: string }>>;
  onPick: (category: TorchCategory, reason: RemovalReason) => void;
}) {
  return (
    <fieldset className="space-y-3">
      <legend className="text-base font-bold">Why did each part come out?</legend>
      {categories.map((c) => {
        const current = reasons[c];
        const options = categories.length > 1 ? [...COMMON.slice(0, 4), 'with-partner' as const, COMMON[4]] : COMMON;
        const processId = `process-${c}`;
        return (
          <div key={c} role="group" aria-label={`Why the ${PART_CATEGORY_LABELS[c].toLowerCase()} came out`} className="space-y-1">
            <p className="font-semibold">{PART_CATEGORY_LABELS[c]}</p>
            <div className="flex flex-wrap gap-2">
              {options.map((r) => (
                <button key={r} type="button" className={`${chip} ${current === r ? on : off}`} aria-pressed={current === r} onClick={() => onPick(c, r)}>
                  {REMOVAL_REASON_LABELS[r]}
                </button>
              ))}
              <label htmlFor={processId} className="sr-only">
                Process fault for the {PART_CATEGORY_LABELS[c].toLowerCase()}
              </label>
              <select
                id={processId}
                className={`${chip} ${current && PROCESS.includes(current) ? on : off}`}
                value={current && PROCESS.includes(current) ? current : ''}
                onChange={(ev) => ev.target.value && onPick(c, ev.target.value as RemovalReason)}
              >
                <option value="">Process fault…</option>
                {PROCESS.map((r) => (
                  <option key={r} value={r}>
                    {REMOVAL_REASON_LABELS[r]}
                  </option>
                ))}
              </select>
            </div>
            {errors?.[c]?.message ? (
              <p role="alert" className="text-sm font-semibold text-danger">
                {errors[c]!.message}
              </p>
            ) : null}
          </div>
        );
      })}
    </fieldset>
  );
}
