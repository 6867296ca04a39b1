"use client";
/**
 * A number field read as the server reads it: lib/validation/typed-number.ts in the browser's
 * locale, checked when the field is left, so a panelist sees at once what is wrong with "12k" or
 * "0x10" (the server checks again with the same function). <LocaleField/> sends that locale
 * with the form, so the server reads "12,5" the way the panelist meant it.
 */
import { useEffect, useState } from "react";
import { parseTypedNumber } from "../validation/typed-number";

/** The browser's locale, once mounted ("en" on the server's first render). */
function useBrowserLocale(): string {
  const [locale, setLocale] = useState("en");
  useEffect(() => setLocale(navigator.language || "en"), []);
  return locale;
}

export function LocaleField() {
  return <input type="hidden" name="locale" value={useBrowserLocale()} />;
}

export function NumberInput({ name, defaultValue, ariaLabel }: { name: string; defaultValue?: number | string | null; ariaLabel?: string }) {
  const locale = useBrowserLocale();
  const [problem, setProblem] = useState<string | null>(null);
  const shown =
    defaultValue === null || defaultValue === undefined || defaultValue === ""
      ? ""
      : typeof defaultValue === "number"
        ? new Intl.NumberFormat(locale, { useGrouping: false, maximumFractionDigits: 20 }).format(defaultValue)
        : defaultValue;
  return (
    <>
      <input
        // Remounted once the browser's locale is known, so the prefilled value uses its decimal mark.
        key={locale}
        name={name}
        inputMode="decimal"
        aria-label={ariaLabel}
        defaultValue={shown}
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
