/**
 * A stopping-rule default with its source, and whether the number is a verified finding or a
 * convention (STOPPING_RULE_DEFAULTS in lib/stats/stopping-rules.ts supplies all three).
 */
import type { RuleDefault } from "@/lib/stats/stopping-rules";

export default function RuleSource({ rule, shown }: { rule: RuleDefault<unknown>; shown: string }) {
  return (
    <span className="source" data-rule-default={shown}>
      Default {shown}.{" "}
      {rule.verified ? (
        <span className="tag tag-verified">verified finding</span>
      ) : (
        <span className="tag tag-convention">convention, not verified</span>
      )}{" "}
      Source: {rule.source} <em>{rule.note}</em>
    </span>
  );
}
