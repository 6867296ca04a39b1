/**
 * The fields of a question (docs/methods.md §14.1), for adding and for editing. Errors
 * from the server appear beside each field (FieldError reads the enclosing ActionForm).
 */
import type { OrganiserQuestionView } from "@/lib/panels/panels";
import { FieldError } from "./action-form";

export default function QuestionFields({ question }: { question?: OrganiserQuestionView }) {
  const q = question;
  return (
    <>
      <label>
        Question <span className="hint">As panelists will read it.</span>
        <textarea name="text" rows={2} defaultValue={q?.text} maxLength={500} />
        <FieldError name="text" />
      </label>
      <div className="row">
        <label>
          Unit <span className="hint">e.g. units, EUR</span>
          <input name="unit" defaultValue={q?.unit} maxLength={40} />
          <FieldError name="unit" />
        </label>
        <label>
          Target period <span className="hint">e.g. first 12 months after launch</span>
          <input name="targetPeriod" defaultValue={q?.targetPeriod} maxLength={60} />
          <FieldError name="targetPeriod" />
        </label>
      </div>
      <div className="row">
        <label>
          Lower plausible bound
          <input name="lowerBound" inputMode="decimal" defaultValue={q?.lowerBound} />
          <FieldError name="lowerBound" />
        </label>
        <label>
          Upper plausible bound
          <input name="upperBound" inputMode="decimal" defaultValue={q?.upperBound} />
          <FieldError name="upperBound" />
        </label>
      </div>
      <p className="hint">Answers outside the plausible bounds are refused with a message to the panelist.</p>
      <fieldset>
        <legend>Answer format</legend>
        <label className="inline">
          <input type="radio" name="answerFormat" value="single" defaultChecked={(q?.answerFormat ?? "single") === "single"} />
          Single value
        </label>
        <label className="inline">
          <input type="radio" name="answerFormat" value="three-point" defaultChecked={q?.answerFormat === "three-point"} />
          Three-point: low / median / high (read as the 10th / 50th / 90th percentiles)
        </label>
        <FieldError name="answerFormat" />
      </fieldset>
      <fieldset>
        <legend>Aggregation</legend>
        <label className="inline">
          <input type="radio" name="aggregation" value="shared" defaultChecked={(q?.aggregation ?? "shared") === "shared"} />
          Shared quantity — everyone estimates the same number; the panel figure is the median
        </label>
        <label className="inline">
          <input type="radio" name="aggregation" value="sum-of-parts" defaultChecked={q?.aggregation === "sum-of-parts"} />
          Sum of parts — each panelist estimates their own part; the panel figure is the total
        </label>
        <FieldError name="aggregation" />
      </fieldset>
      <fieldset>
        <legend>Calibration question (optional)</legend>
        <label className="inline">
          <input type="checkbox" name="calibration" value="yes" defaultChecked={q?.calibration ?? false} />
          A question whose true value I know: it scores each panelist&apos;s calibration and information (Cooke&apos;s classical
          model, docs/methods.md §21). Asked as three-point with a shared quantity, read as the 5th / 50th / 95th percentiles.
        </label>
        <FieldError name="calibration" />
        <label className="narrow">
          True value <span className="hint">now or later, on the panel page; never shown to panelists</span>
          <input name="trueValue" inputMode="decimal" defaultValue={q?.trueValue ?? ""} />
          <FieldError name="trueValue" />
        </label>
      </fieldset>
    </>
  );
}
