/**
 * Read models for the pages that compose several services (the pages' own; the services and
 * their access rules live in the other files of lib/panels).
 */
import type { Actor } from "@/lib/accounts/actor";
import { getConvergence, getRoundStatistics, type ConvergenceView } from "./rounds";
import type { PartContribution, PooledDistribution, SummaryFigures } from "./round-statistics";

/** A sum-of-parts question's parts in one closed round, by pseudonym. */
export interface RoundParts {
  readonly round: number;
  readonly total: number;
  readonly parts: readonly PartContribution[];
}

/** A three-point question's lows, highs and pooled distribution in one closed round. */
export interface RoundThreePoint {
  readonly round: number;
  readonly lows: SummaryFigures | null;
  readonly highs: SummaryFigures | null;
  readonly pooled: PooledDistribution | null;
}

export interface ConvergencePageView extends ConvergenceView {
  readonly panelId: string;
  /** For each sum-of-parts question (by id): its parts in every closed round. */
  readonly parts: Readonly<Record<string, readonly RoundParts[]>>;
  /** For each three-point question (by id): lows, highs and the pooled distribution per closed round. */
  readonly threePoint: Readonly<Record<string, readonly RoundThreePoint[]>>;
}

/**
 * The convergence view of a panel, plus each sum-of-parts question's parts and each
 * three-point question's lows, highs and pooled distribution per closed round (organisers and
 * reviewers of the panel: the access checks are those of getConvergence and getRoundStatistics).
 */
export async function getConvergencePage(actor: Actor, panelId: string): Promise<ConvergencePageView> {
  const convergence = await getConvergence(actor, panelId);
  const parts: Record<string, RoundParts[]> = {};
  const threePoint: Record<string, RoundThreePoint[]> = {};
  const roundNumbers = [...new Set(convergence.questions.flatMap((q) => q.rounds.map((r) => r.round)))].sort((a, b) => a - b);
  for (const n of roundNumbers) {
    const stats = await getRoundStatistics(actor, panelId, n);
    for (const s of stats.questions) {
      if (s.aggregation === "sum-of-parts" && s.sumOfParts) {
        (parts[s.questionId] ??= []).push({ round: n, total: s.sumOfParts.total, parts: s.sumOfParts.parts });
      }
      if (s.answerFormat === "three-point") {
        (threePoint[s.questionId] ??= []).push({ round: n, lows: s.lows, highs: s.highs, pooled: s.pooled });
      }
    }
  }
  return { ...convergence, panelId, parts, threePoint };
}
