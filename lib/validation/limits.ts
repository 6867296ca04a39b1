/**
 * Size limits shared by every way in (JSON API, server actions, CLI): one organiser must not be
 * able to make a panel or a history so large that reading it holds the server for everybody
 * (issue 11, item 7). The figures are generous for the product's use (issue 13's largest
 * scenario is 1,000 panelists × 50 questions) and bounded; README.md states them.
 */
import { InvalidInputError } from "../errors";

/** Questions on one panel. */
export const MAX_QUESTIONS_PER_PANEL = 100;
/** Invitations (panelists) on one panel, revoked ones included. */
export const MAX_PANELISTS_PER_PANEL = 2_000;
/** People on one organiser's roster. */
export const MAX_ROSTER_MEMBERS = 5_000;
/**
 * Rows of a baseline history (CSV data rows, future rows included, or pasted values). 5,000
 * observations are over 400 years of monthly or 1,250 years of quarterly business history; the
 * automatic method choice fits every candidate at many forecast origins, so the cost grows with
 * the length, and longer histories only make a 5,000-row fit (about 1.5 s here) longer.
 */
export const MAX_HISTORY_ROWS = 5_000;

/**
 * Refuses (422 naming `field`) when adding `adding` items to the `current` ones would pass
 * `limit`. `what` names the items in the plural, `where` their container ("A panel").
 */
export function requireWithinLimit(
  limit: { readonly current: number; readonly adding: number; readonly max: number },
  field: string,
  what: string,
  where: string,
): void {
  if (limit.current + limit.adding <= limit.max) return;
  throw new InvalidInputError(
    [{ field, message: `${where} holds at most ${limit.max} ${what}; it has ${limit.current}${limit.adding > 1 ? ` and this would add ${limit.adding}` : ""}` }],
    `Limit reached: at most ${limit.max} ${what}.`,
  );
}

/**
 * Data rows of CSV text: non-blank lines after the header, a line ending at LF, CR or CR LF (a
 * quoted cell spanning lines counts each line, which only errs towards refusing). Counting
 * stops past `stopAfter`, so a huge text costs one scan at most; nothing is parsed.
 */
export function csvDataRows(text: string, stopAfter = Number.POSITIVE_INFINITY): number {
  let lines = 0;
  let blank = true;
  for (let i = 0; i < text.length && lines <= stopAfter + 1; i++) {
    const c = text.charCodeAt(i);
    if (c === 10 || c === 13) {
      if (!blank) lines++;
      blank = true;
    } else if (c !== 32 && c !== 9) blank = false;
  }
  if (!blank) lines++;
  return Math.max(0, lines - 1);
}

/** The refusal of a CSV history with more than MAX_HISTORY_ROWS data rows, else null. */
export function historyRowsMessage(csv: string): string | null {
  const rows = csvDataRows(csv, MAX_HISTORY_ROWS + 1);
  return rows > MAX_HISTORY_ROWS
    ? `at most ${MAX_HISTORY_ROWS} data rows (far longer than any monthly or quarterly business history); this history has more`
    : null;
}
