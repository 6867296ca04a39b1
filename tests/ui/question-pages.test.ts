/**
 * The pages of questions on a panelist's answer and feedback pages (lib/ui/question-pages.tsx):
 * which slice a `?page=` value shows, for every kind of value a link or a hand-edited address
 * can carry. Expected slices are worked out by hand from the stated policy (10 per page).
 */
import { describe, expect, it } from "vitest";
import { QUESTIONS_PER_PAGE, questionPage } from "@/lib/ui/question-pages";

describe("questionPage", () => {
  it("cuts 25 questions into pages of 10, 10 and 5 (by hand)", () => {
    expect(QUESTIONS_PER_PAGE).toBe(10);
    expect(questionPage(25, "1")).toEqual({ page: 1, pages: 3, from: 0, to: 10 });
    expect(questionPage(25, "2")).toEqual({ page: 2, pages: 3, from: 10, to: 20 });
    expect(questionPage(25, "3")).toEqual({ page: 3, pages: 3, from: 20, to: 25 });
  });

  it("gives the nearest valid page for absent, unreadable or out-of-range values", () => {
    expect(questionPage(25, undefined).page).toBe(1);
    expect(questionPage(25, "abc").page).toBe(1);
    expect(questionPage(25, ["2", "3"]).page).toBe(1);
    expect(questionPage(25, "-2").page).toBe(1);
    expect(questionPage(25, "0").page).toBe(1);
    expect(questionPage(25, "1e3").page).toBe(1);
    expect(questionPage(25, "99").page).toBe(3);
    expect(questionPage(25, "9999999999999").page).toBe(1);
  });

  it("shows the page holding a question asked for by its position, whatever ?page= says", () => {
    expect(questionPage(25, "1", 14)).toEqual({ page: 2, pages: 3, from: 10, to: 20 });
    expect(questionPage(25, "3", 0).page).toBe(1);
    // A position outside the list (an unknown question id gives -1) falls back to ?page=.
    expect(questionPage(25, "3", -1).page).toBe(3);
  });

  it("has one page, possibly empty, for at most 10 questions", () => {
    expect(questionPage(0, "4")).toEqual({ page: 1, pages: 1, from: 0, to: 0 });
    expect(questionPage(10, "2")).toEqual({ page: 1, pages: 1, from: 0, to: 10 });
  });
});
