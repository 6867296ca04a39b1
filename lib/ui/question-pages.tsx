/**
 * Questions a panelist's page shows at a time (issue 13: a phone got every question of a long
 * panel, with its feedback, in one page — 3 MB at 300 panelists × 30 questions). A page holds
 * {@link QUESTIONS_PER_PAGE} questions in their order; the pager links to the others.
 */

/** Questions per page of a panelist's answer or feedback page. */
export const QUESTIONS_PER_PAGE = 10;

export interface QuestionPage {
  /** 1-based page number shown. */
  readonly page: number;
  readonly pages: number;
  /** Index of the first question on the page and one past the last (slice bounds). */
  readonly from: number;
  readonly to: number;
}

/**
 * The page of `count` questions that a `?page=` value asks for. Anything that is not a whole
 * number from 1 to the last page gives a valid page: 1 below the range (0), the last above it,
 * and 1 when unreadable (absent, text, a sign, repeated, more than six digits).
 * With `index` (a question's position, 0-based) the page holding that question wins.
 */
export function questionPage(count: number, requested: unknown, index?: number): QuestionPage {
  const pages = Math.max(1, Math.ceil(count / QUESTIONS_PER_PAGE));
  const asked = typeof requested === "string" && /^\d{1,6}$/.test(requested) ? Number(requested) : 1;
  const page = index !== undefined && index >= 0 && index < count ? Math.floor(index / QUESTIONS_PER_PAGE) + 1 : Math.min(pages, Math.max(1, asked));
  const from = (page - 1) * QUESTIONS_PER_PAGE;
  return { page, pages, from, to: Math.min(count, from + QUESTIONS_PER_PAGE) };
}

/**
 * Links to every page of questions ("Questions 1–10", …), the current one marked; nothing when
 * all questions fit on one page. `note(from, to)` adds a short status per page (e.g. how many
 * are answered).
 */
export function QuestionPager({ at, count, href, note }: { at: QuestionPage; count: number; href: (page: number) => string; note?: (from: number, to: number) => string }) {
  if (at.pages <= 1) return null;
  return (
    <nav className="question-pages" aria-label="Pages of questions">
      <ul>
        {Array.from({ length: at.pages }, (_, i) => {
          const from = i * QUESTIONS_PER_PAGE;
          const to = Math.min(count, from + QUESTIONS_PER_PAGE);
          const label = `Questions ${from + 1}–${to}`;
          const extra = note ? ` (${note(from, to)})` : "";
          return (
            <li key={i}>
              {i + 1 === at.page ? (
                <strong aria-current="page">
                  {label}
                  {extra}
                </strong>
              ) : (
                <a href={href(i + 1)} data-question-page={i + 1}>
                  {label}
                  {extra}
                </a>
              )}
            </li>
          );
        })}
      </ul>
    </nav>
  );
}
