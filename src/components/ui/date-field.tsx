import { useId, useRef, useState } from 'react';
import { datePattern, formatTypedDate, parseTypedDate } from '../../../shared/domain/typed-date';
import { useShopFormat } from '../../lib/format';

/**
 * A date that can be typed in the shop's usual form (11/01/2026) or ISO (2026-11-01), or picked
 * from the browser's calendar. The value is YYYY-MM-DD or ''. A typed date counts once it is a
 * whole date with a four-digit year, so a half-typed "11/01/2" never becomes year 2 (the native
 * date input does that when typed quickly); leaving the field or pressing Enter says what is wrong.
 */
export function DateField({
  label,
  value,
  onChange,
  error,
  locale: givenLocale,
  min,
  className = '',
}: {
  label: string;
  value: string;
  onChange: (value: string) => void;
  /** A problem the page found (a reversed range), shown like a typing mistake. */
  error?: string | null;
  /** The shop's locale unless given: its numeric date order is the one people type. */
  locale?: string;
  min?: string;
  className?: string;
}) {
  const shop = useShopFormat();
  const locale = givenLocale ?? shop.locale;
  const id = useId();
  const picker = useRef<HTMLInputElement>(null);
  const pattern = datePattern(locale);
  const [text, setText] = useState(() => (value ? formatTypedDate(value, locale) : ''));
  const [typedError, setTypedError] = useState<string | null>(null);
  // A value set from outside (the picker, the address, a reset) is shown the shop's way.
  const [shown, setShown] = useState(value);
  if (shown !== value) {
    setShown(value);
    if (parseTypedDate(text, locale) !== value) {
      setText(value ? formatTypedDate(value, locale) : '');
      setTypedError(null);
    }
  }

  const commit = (final: boolean) => {
    const read = parseTypedDate(text, locale);
    if (read === null) {
      setTypedError(null);
      if (value) onChange('');
    } else if (typeof read === 'string') {
      setTypedError(null);
      if (read !== value) onChange(read);
      if (final) setText(formatTypedDate(read, locale));
    } else if (final) setTypedError(read.error);
  };
  const shownError = typedError ?? error ?? null;
  const errorId = `${id}-error`;
  const hintId = `${id}-hint`;

  return (
    <div className={`flex flex-col text-sm font-semibold ${className}`}>
      <label htmlFor={id}>{label}</label>
      <div className="flex items-stretch gap-1">
        <input
          id={id}
          type="text"
          inputMode="numeric"
          autoComplete="off"
          placeholder={pattern}
          value={text}
          aria-invalid={shownError ? true : undefined}
          aria-describedby={shownError ? `${errorId} ${hintId}` : hintId}
          className={`min-h-touch w-36 rounded border bg-white px-3 font-normal ${shownError ? 'border-2 border-danger' : 'border-steel-400'}`}
          onChange={(e) => {
            setText(e.target.value);
            const read = parseTypedDate(e.target.value, locale);
            // Counted as soon as it is a whole date; errors wait until the person is done typing.
            if (read === null || typeof read === 'string') {
              setTypedError(null);
              if ((read ?? '') !== value) onChange(read ?? '');
            }
          }}
          onBlur={() => commit(true)}
          onKeyDown={(e) => {
            if (e.key === 'Enter') commit(true);
          }}
        />
        <button
          type="button"
          className="inline-flex min-h-touch min-w-touch items-center justify-center rounded border border-steel-400 bg-white"
          aria-label={`Pick the ${label.toLowerCase()} date from a calendar`}
          onClick={() => {
            try {
              picker.current?.showPicker();
            } catch {
              picker.current?.focus();
            }
          }}
        >
          <svg aria-hidden="true" viewBox="0 0 24 24" className="h-6 w-6" fill="none" stroke="currentColor" strokeWidth="2">
            <rect x="3" y="5" width="18" height="16" rx="2" />
            <path d="M3 10h18M8 3v4M16 3v4" />
          </svg>
        </button>
        {/* The browser's own calendar, opened by the button; typing goes to the text field above. */}
        <input
          ref={picker}
          type="date"
          tabIndex={-1}
          aria-hidden="true"
          className="sr-only"
          value={value}
          min={min}
          onChange={(e) => {
            if (/^\d{4}-\d{2}-\d{2}$/.test(e.target.value) || e.target.value === '') onChange(e.target.value);
          }}
        />
      </div>
      <p id={hintId} className="font-normal text-steel-700">
        {pattern}
      </p>
      {shownError ? (
        <p id={errorId} role="alert" className="max-w-56 font-semibold text-danger">
          {shownError}
        </p>
      ) : null}
    </div>
  );
}
