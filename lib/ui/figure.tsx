/**
 * A figure shown rounded, with its exact value in `data-value` (and in the title, for a
 * reader who wants every digit).
 */
import { formatExact, formatNumber, formatPercent } from "./format";

export default function Figure({
  value,
  name,
  percent = false,
  digits,
}: {
  value: number | null | undefined;
  name?: string;
  percent?: boolean;
  digits?: number;
}) {
  const exact = value === null || value === undefined || Number.isNaN(value) ? "" : String(value);
  return (
    <span data-stat={name} data-value={exact} title={value === null || value === undefined || Number.isNaN(value) ? "not defined" : formatExact(value)}>
      {percent ? formatPercent(value, digits) : formatNumber(value, digits)}
    </span>
  );
}
