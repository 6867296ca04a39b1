"use server";
/**
 * Server actions of the organiser's question page: baseline (preview or attach), blend weight
 * rule, outcome and its audited correction. Each one: parse the form with the zod schema
 * from lib/validation, call one service, revalidate, return what the form shows.
 */
import { revalidatePath } from "next/cache";
import { attachBaseline, previewBaseline, type BaselineView } from "@/lib/triangulation/baselines";
import { correctOutcome, previewOutcome, recordOutcome, type OutcomePreview } from "@/lib/triangulation/outcome";
import { setQuestionBlendRule } from "@/lib/triangulation/triangulation";
import { getCurrentUser } from "@/lib/session";
import { params } from "@/lib/validation/inputs";
import { baselineInput, questionBlendRuleInput, outcomeCorrection, outcomeInput } from "@/lib/validation/triangulation-inputs";
import type { FormState } from "@/lib/actions/form-state";
import type { BaselineFormState, BaselinePreviewPayload } from "@/lib/ui/baseline-form";
import { formObject, fromThrown, fromZodError, withNumbers } from "@/lib/actions/form-result";
import { baselineFormValues } from "@/lib/ui/baseline-form-values";
import { launchPreview } from "@/lib/ui/launch-table";
import { NOT_SIGNED_IN, signedInAction } from "@/lib/actions/signed-in-action";
import { textProblems } from "@/lib/actions/action-guard";
import { formatExact } from "@/lib/ui/format";


function revalidate(panelId: string, questionId: string): void {
  revalidatePath(`/panels/${panelId}/questions/${questionId}`);
  revalidatePath(`/panels/${panelId}`);
  revalidatePath(`/reports/${panelId}`);
  revalidatePath(`/reports/${panelId}/questions/${questionId}`);
}

/** After an outcome changes: the question's pages plus the track records and accuracy history. */
function revalidateScored(panelId: string, questionId: string): void {
  revalidate(panelId, questionId);
  revalidatePath("/accuracy");
  revalidatePath("/roster");
}

function payload(v: BaselineView): BaselinePreviewPayload {
  return {
    labels: v.preview.rows.map((r) => String(r.row)),
    history: v.preview.rows.map((r) => r.scaled),
    valueColumn: v.preview.valueColumn,
    explanatoryColumns: v.preview.explanatoryColumns,
    ignoredColumns: v.preview.ignoredColumns,
    observations: v.preview.observations,
    missing: v.preview.missing,
    scaleFactor: v.preview.scaleFactor,
    method: v.result.method,
    horizon: v.horizon,
    target: v.target,
    ...(v.result.launch ? { launch: launchPreview(v.result) } : {}),
  };
}

export async function baselineAction(_p: BaselineFormState, formData: FormData): Promise<BaselineFormState> {
  const user = await getCurrentUser();
  if (!user) return NOT_SIGNED_IN;
  const values = formObject(formData);
  const refused = textProblems(values);
  if (refused) return refused;
  const id = params.question.safeParse(values);
  if (!id.success) return fromZodError(id.error);
  const read = baselineFormValues(values);
  if (!read.ok) return { ok: false, message: "Please correct the fields marked below.", fieldErrors: read.fieldErrors };
  const parsed = baselineInput.safeParse(read.input);
  if (!parsed.success) return fromZodError(parsed.error);
  try {
    if (values.intent === "attach") {
      const v = await attachBaseline(user, id.data.panelId, id.data.questionId, parsed.data);
      revalidate(id.data.panelId, id.data.questionId);
      return { ok: true, attached: true, message: `Baseline attached: ${v.result.method}, ${v.preview.observations} observations.`, preview: payload(v) };
    }
    const v = await previewBaseline(user, id.data.panelId, id.data.questionId, parsed.data);
    return { ok: true, preview: payload(v) };
  } catch (error) {
    return fromThrown(error);
  }
}

export async function blendRuleAction(_p: FormState, formData: FormData): Promise<FormState> {
  const { panelId, questionId, ...rest } = formObject(formData);
  const input = withNumbers(rest, ["panelWeight"]);
  if (rest.rule !== "organiser") delete input.panelWeight;
  return signedInAction({ panelId, questionId }, params.question, async (user, id, rule) => {
    const r = await setQuestionBlendRule(user, id.panelId, id.questionId, rule);
    revalidate(id.panelId, id.questionId);
    return { ok: true, message: `Weight rule: ${r.rule}${r.rule === "organiser" ? ` (${r.panelWeight} on the panel)` : ""}, from the ${r.from}.` };
  }, [questionBlendRuleInput, input]);
}

/**
 * The first submission of an outcome value only checks it (as saving would) and shows the number
 * as it will be stored, with its unit; the form's confirm button sends it back as
 * `confirmOutcome`, and only a submission whose outcome value equals it is saved.
 */
function confirmStep(p: OutcomePreview): FormState {
  const v = `${formatExact(p.outcomeValue)} ${p.unit}`;
  const correcting = p.recorded !== null;
  return {
    confirm: {
      field: "confirmOutcome",
      value: String(p.outcomeValue),
      text: correcting
        ? `Correct the recorded outcome value from ${formatExact(p.recorded!)} ${p.unit} to ${v}? The correction and your reason are logged.`
        : `Record ${v} as the outcome of “${p.text}”? Every figure is scored against it; a later correction is logged.`,
      submitLabel: correcting ? `Yes, correct it to ${v}` : `Yes, record ${v}`,
    },
  };
}

/** True when the form carries the confirmation of exactly this value. */
function confirmed(values: Record<string, string>, outcomeValue: number): boolean {
  return values.confirmOutcome !== undefined && values.confirmOutcome !== "" && Number(values.confirmOutcome) === outcomeValue;
}

export async function recordOutcomeAction(_p: FormState, formData: FormData): Promise<FormState> {
  const values = formObject(formData);
  return signedInAction(values, params.question, async (user, id, input) => {
    if (!confirmed(values, input.outcomeValue)) return confirmStep(await previewOutcome(user, id.panelId, id.questionId, input, "record"));
    const r = await recordOutcome(user, id.panelId, id.questionId, input);
    revalidateScored(id.panelId, id.questionId);
    return { ok: true, message: `Outcome recorded: ${formatExact(r.outcomeValue)}; every figure is scored below.` };
  }, [outcomeInput, withNumbers({ outcomeValue: values.outcomeValue ?? "", note: values.note ?? "" }, ["outcomeValue"])]);
}

export async function correctOutcomeAction(_p: FormState, formData: FormData): Promise<FormState> {
  const values = formObject(formData);
  return signedInAction(values, params.question, async (user, id, input) => {
    if (!confirmed(values, input.outcomeValue)) return confirmStep(await previewOutcome(user, id.panelId, id.questionId, input, "correct"));
    const r = await correctOutcome(user, id.panelId, id.questionId, input);
    revalidateScored(id.panelId, id.questionId);
    return { ok: true, message: `Outcome value corrected to ${formatExact(r.outcomeValue)}; the correction and its reason are in the audit log.` };
  }, [outcomeCorrection, withNumbers({ outcomeValue: values.outcomeValue ?? "", reason: values.reason ?? "" }, ["outcomeValue"])]);
}
