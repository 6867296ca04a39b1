"use client";
/**
 * The portfolio's table, sortable by any column: a column's button sorts ascending, a second
 * press descending. Empty cells (no blend yet, no outcome, no change) go last either way. The
 * table says its order in `aria-sort` on the sorted column and in `data-sort` on the table.
 */
import { useState } from "react";
import Figure from "./figure";

export interface PortfolioTableRow {
  readonly questionId: string;
  readonly panelId: string;
  readonly panelTitle: string;
  readonly questionText: string;
  readonly unit: string;
  readonly targetPeriod: string;
  readonly figure: number | null;
  readonly lower80: number | null;
  readonly upper80: number | null;
  /** settled 2, not settled 1, no closed round 0 (the sort order). */
  readonly convergenceRank: number;
  readonly convergenceLabel: string;
  readonly outcome: number | null;
  readonly change: number | null;
  readonly fromRound: number | null;
  readonly toRound: number | null;
}

type Key = "panel" | "question" | "figure" | "range" | "convergence" | "outcome" | "change";

const COLUMNS: readonly { key: Key; label: string; num?: boolean }[] = [
  { key: "panel", label: "Panel" },
  { key: "question", label: "Question" },
  { key: "figure", label: "Blended figure", num: true },
  { key: "range", label: "80% range", num: true },
  { key: "convergence", label: "Convergence" },
  { key: "outcome", label: "Outcome", num: true },
  { key: "change", label: "Change since previous round", num: true },
];

function sortValue(r: PortfolioTableRow, key: Key): string | number | null {
  switch (key) {
    case "panel":
      return r.panelTitle;
    case "question":
      return r.questionText;
    case "figure":
      return r.figure;
    case "range":
      return r.lower80;
    case "convergence":
      return r.convergenceRank;
    case "outcome":
      return r.outcome;
    case "change":
      return r.change;
  }
}

function compare(a: string | number | null, b: string | number | null): number {
  if (typeof a === "number" && typeof b === "number") return a - b;
  return String(a).localeCompare(String(b), "en-GB");
}

export default function PortfolioTable({ rows }: { rows: readonly PortfolioTableRow[] }) {
  const [sort, setSort] = useState<{ key: Key; dir: "ascending" | "descending" } | null>(null);
  const shown = sort
    ? [...rows].sort((x, y) => {
        const a = sortValue(x, sort.key);
        const b = sortValue(y, sort.key);
        if (a === null || b === null) return a === b ? 0 : a === null ? 1 : -1;
        return sort.dir === "ascending" ? compare(a, b) : compare(b, a);
      })
    : rows;
  const press = (key: Key) => setSort((s) => ({ key, dir: s?.key === key && s.dir === "ascending" ? "descending" : "ascending" }));
  return (
    <div className="table-scroll">
      <table data-portfolio data-sort={sort ? `${sort.key} ${sort.dir}` : "none"}>
        <caption className="muted small">Press a column&apos;s name to sort by it; press again to reverse. Empty cells stay last.</caption>
        <thead>
          <tr>
            {COLUMNS.map((c) => (
              <th key={c.key} scope="col" className={c.num ? "num" : undefined} aria-sort={sort?.key === c.key ? sort.dir : undefined}>
                <button type="button" className="link-button" onClick={() => press(c.key)}>
                  {c.label}
                  {sort?.key === c.key ? (sort.dir === "ascending" ? " ▲" : " ▼") : ""}
                </button>
              </th>
            ))}
          </tr>
        </thead>
        <tbody>
          {shown.map((r) => (
            <tr key={r.questionId} data-portfolio-row={r.questionId}>
              <td>
                <a href={`/reports/${r.panelId}`}>{r.panelTitle}</a>
              </td>
              <td>
                <a href={`/reports/${r.panelId}/questions/${r.questionId}`}>{r.questionText}</a>{" "}
                <span className="muted small">
                  ({r.unit}, {r.targetPeriod})
                </span>
              </td>
              <td className="num">{r.figure === null ? <span className="muted">no blend yet</span> : <Figure value={r.figure} name="portfolio-figure" />}</td>
              <td className="num">
                {r.lower80 === null || r.upper80 === null ? (
                  "—"
                ) : (
                  <>
                    <Figure value={r.lower80} name="portfolio-lower80" /> to <Figure value={r.upper80} name="portfolio-upper80" />
                  </>
                )}
              </td>
              <td>{r.convergenceLabel}</td>
              <td className="num">{r.outcome === null ? "—" : <Figure value={r.outcome} name="portfolio-outcome" />}</td>
              <td className="num">
                {r.change === null ? (
                  "—"
                ) : (
                  <>
                    {r.change > 0 ? "+" : ""}
                    <Figure value={r.change} name="portfolio-change" />{" "}
                    <span className="muted small">
                      (round {r.fromRound} to {r.toRound})
                    </span>
                  </>
                )}
              </td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}
