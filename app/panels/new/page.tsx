import type { Metadata } from "next";
import { STOPPING_RULE_DEFAULTS as D } from "@/lib/stats/stopping-rules";
import ActionForm, { FieldError } from "@/lib/ui/action-form";
import { formatPercent } from "@/lib/ui/format";
import { requireOrganiserPage } from "@/lib/ui/require-user";
import RuleSource from "@/lib/ui/rule-source";
import { createPanelAction } from "./actions";

export const metadata: Metadata = { title: "New panel" };

export default async function NewPanelPage() {
  await requireOrganiserPage("/panels/new");
  return (
    <section>
      <h1>New panel</h1>
      <p className="muted">
        A panel asks the same questions of several experts over anonymous rounds. You add questions and invite
        panelists on the next page. The stopping rules below decide when the app recommends ending the rounds; the
        decision stays yours.
      </p>
      <ActionForm action={createPanelAction} submitLabel="Create panel" pendingLabel="Creating…" className="stack">
        <label>
          Title <span className="hint">e.g. "Year-one volume of the Wren-2 soil-moisture sensor"</span>
          <input name="title" required maxLength={200} />
          <FieldError name="title" />
        </label>
        <label>
          Description <span className="hint">What the panel is for; panelists see it.</span>
          <textarea name="description" rows={3} maxLength={4000} />
          <FieldError name="description" />
        </label>
        <fieldset>
          <legend>Consensus rule</legend>
          <p className="hint">A question has reached consensus when the chosen measure of spread is at or under the threshold.</p>
          <label className="inline">
            <input type="radio" name="consensusMeasure" value="cv" defaultChecked={D.consensusMeasure.value === "cv"} />
            Coefficient of variation (SD / mean)
          </label>
          <label className="inline">
            <input
              type="radio"
              name="consensusMeasure"
              value="relative-iqr"
              defaultChecked={D.consensusMeasure.value === "relative-iqr"}
            />
            Relative IQR (IQR / |median|)
          </label>
          <FieldError name="consensusMeasure" />
          <RuleSource rule={D.consensusMeasure} shown={D.consensusMeasure.value === "cv" ? "coefficient of variation" : "relative IQR"} />
          <label>
            Threshold
            <input name="consensusThreshold" inputMode="decimal" defaultValue={D.consensusThreshold.cv.value} />
            <FieldError name="consensusThreshold" />
          </label>
          <p className="hint">For the coefficient of variation:</p>
          <RuleSource rule={D.consensusThreshold.cv} shown={String(D.consensusThreshold.cv.value)} />
          <p className="hint">For the relative IQR:</p>
          <RuleSource rule={D.consensusThreshold["relative-iqr"]} shown={String(D.consensusThreshold["relative-iqr"].value)} />
        </fieldset>
        <fieldset>
          <legend>Stability rule</legend>
          <label>
            Largest change between rounds, as a fraction <span className="hint">0.15 means 15%; applies to both the median and the IQR</span>
            <input name="stabilityThreshold" inputMode="decimal" defaultValue={D.stabilityThreshold.value} />
            <FieldError name="stabilityThreshold" />
          </label>
          <RuleSource rule={D.stabilityThreshold} shown={formatPercent(D.stabilityThreshold.value, 0)} />
        </fieldset>
        <fieldset>
          <legend>Round limit</legend>
          <label>
            Most rounds
            <input name="roundLimit" inputMode="numeric" defaultValue={D.roundLimit.value} />
            <FieldError name="roundLimit" />
          </label>
          <RuleSource rule={D.roundLimit} shown={`${D.roundLimit.value} rounds`} />
        </fieldset>
      </ActionForm>
    </section>
  );
}
