"use client";
/**
 * A number field read as the server reads it: lib/validation/typed-number.ts in the browser's
 * locale, checked when the field is left, so a panelist sees at once what is wrong with "12k" or
 * "0x10" (the server checks again with the same function). <LocaleField/> sends that locale
 * with the form, so the server reads "12,5" the way the panelist meant it.
 */
import { useEffect, useRef, useState } from "react";
import { parseTypedNumber } from "../validation/typed-number";

/** The browser's locale once mounted; `initial` before (on the server's render). */
function useBrowserLocale(initial = "en"): string {
  const [locale, setLocale] = useState(initial);
  useEffect(() => setLocale(navigator.language || "en"), []);
  return locale;
}

/** Empty until the page runs in the browser: the server then reads Accept-Language instead. */
export function LocaleField() {
  return <input type="hidden" name="locale" value={useBrowserLocale("")} />;
}

export function NumberInput({ name, defaultValue, ariaLabel }: { name: string; defaultValue?: number | string | null; ariaLabel?: string }) {
  const locale = useBrowserLocale();
  const [problem, setProblem] = useState<string | null>(null);
  const input = useRef<HTMLInputElement>(null);
  // Rendered on the server as a plain number ("12.5"); once the browser's locale is known, an
  // untouched prefilled value is shown with that locale's decimal mark ("12,5"), as it is read back.
  const plain = defaultValue === null || defaultValue === undefined ? "" : String(defaultValue);
  useEffect(() => {
    const el = input.current;
    if (!el || typeof defaultValue !== "number" || el.value !== plain) return;
    el.value = new Intl.NumberFormat(locale, { useGrouping: false, maximumFractionDigits: 20 }).format(defaultValue);
  }, [locale, defaultValue, plain]);
  return (
    <>
      <input
        ref={input}
        name={name}
        inputMode="decimal"
        aria-label={ariaLabel}
        defaultValue={plain}
        aria-invalid={problem ? true : undefined}
        onBlur={(e) => {
          const read = parseTypedNumber(e.currentTarget.value, locale);
          setProblem("error" in read ? read.error : null);
        }}
      />
      {problem ? (
        <span className="field-error" data-typed-number-error={name}>
          {problem}
        </span>
      ) : null}
    </>
  );
}
