import type { FieldErrors, UseFormRegister } from 'react-hook-form';
import { SelectField, TextField } from '../../../components/ui/field';
import type { LockPointRow } from '../../../../shared/schemas/safety-lockout';
import {
  TAG_ONLY_BASES,
  TAG_ONLY_BASIS_LABELS,
  TAG_ONLY_MEASURE_EXAMPLES,
  tagJustificationText,
  type TagOnlyBasis,
} from '../../../../shared/schemas/safety-tag-only';

type PointFields = { points: { tagJustification?: TagOnlyBasis; tagMeasure?: string }[] };

/**
 * Shown on a point of the apply form only when "Tag only" is chosen: why a tag is used alone
 * (1910.147(c)(3)(i) or (ii)) and, for full protection, the additional measure taken.
 */
export function TagOnlyReasonFields<T extends PointFields>({
  index,
  sourceKey,
  basis,
  register,
  errors,
}: {
  index: number;
  sourceKey: string;
  basis: TagOnlyBasis | undefined;
  register: UseFormRegister<T>;
  errors: FieldErrors<T>;
}) {
  const reg = register as unknown as UseFormRegister<PointFields>;
  const err = (errors as FieldErrors<PointFields>).points?.[index];
  return (
    <div className="grid gap-3 rounded border border-caution bg-caution-soft p-3 md:col-span-5 md:grid-cols-2">
      <SelectField
        label={`Why a tag alone on ${sourceKey}`}
        error={err?.tagJustification?.message}
        options={[
          { value: '', label: 'Choose the reason (1910.147(c)(3))' },
          ...TAG_ONLY_BASES.map((b) => ({ value: b, label: `${TAG_ONLY_BASIS_LABELS[b].title} — ${TAG_ONLY_BASIS_LABELS[b].source}` })),
        ]}
        {...reg(`points.${index}.tagJustification`, { setValueAs: (v: string) => v || undefined })}
      />
      {basis === 'full-protection' ? (
        <TextField
          label={`Additional safety measure on ${sourceKey}`}
          hint={`For example: ${TAG_ONLY_MEASURE_EXAMPLES.join('; ').toLowerCase()} (1910.147(c)(3)(iii)).`}
          autoComplete="off"
          error={err?.tagMeasure?.message}
          {...reg(`points.${index}.tagMeasure`)}
        />
      ) : (
        <p className="self-center text-sm text-steel-800">
          A tag is a warning, not a physical restraint: use a lock wherever the device can take one (1910.147(c)(2)(ii)).
        </p>
      )}
    </div>
  );
}

/** The device cell of a lockout's points: the device and, for a tag used alone, its recorded reason. */
export function DeviceWithReason({ point, label }: { point: Pick<LockPointRow, 'device' | 'tagJustification' | 'tagMeasure'>; label: string }) {
  if (point.device !== 'tag-only') return <>{label}</>;
  return (
    <span>
      {label}
      <span className="block text-sm text-steel-700">
        {point.tagJustification
          ? `Tag alone: ${tagJustificationText(point.tagJustification, point.tagMeasure)}`
          : 'No reason recorded (signed before reasons were asked)'}
      </span>
    </span>
  );
}
