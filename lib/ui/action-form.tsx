"use client";
/**
 * A form wired to a server action through React's useActionState. Field errors returned by the
 * action are read by <FieldError name="…"/> anywhere inside the form; a form-level message and
 * any secret shown once appear above the submit row. The form is submitted in a transition
 * (not through the `action` prop) so that what the user typed stays in place when the server
 * rejects it; it is cleared only after a success, when `resetOnSuccess` is set.
 */
import { createContext, startTransition, useActionState, useContext, useEffect, useRef, type ComponentProps, type ReactNode } from "react";
import { CopyButton } from "./copy-button";
import { useReady } from "./use-ready";
import ErrorBanner from "./error-banner";
import { EMPTY_FORM_STATE, type FormAction, type FormState } from "../actions/form-state";

const StateContext = createContext<FormState>(EMPTY_FORM_STATE);
const PendingContext = createContext(false);
/** Whether the form's script has run (its submits go through the action, not the browser). */
const ReadyContext = createContext(false);

export interface ActionFormProps {
  readonly action: FormAction;
  readonly children: ReactNode;
  readonly submitLabel: string;
  readonly pendingLabel?: string;
  readonly resetOnSuccess?: boolean;
  /** Asks for confirmation before submitting (e.g. before a logged action). */
  readonly confirm?: string;
  readonly className?: string;
  readonly submitClassName?: string;
  readonly successMessage?: string;
  readonly ariaLabel?: string;
  /** Keeps the form (and what it last returned, e.g. secrets shown once) but disables submitting. */
  readonly submitDisabled?: boolean;
  /**
   * The children hold other submit buttons (with a name and value): Enter in a field then still
   * submits as the main button would (a hidden first button is the form's default button).
   */
  readonly otherSubmits?: boolean;
}

export default function ActionForm({
  action,
  children,
  submitLabel,
  pendingLabel,
  resetOnSuccess = false,
  confirm,
  className,
  submitClassName,
  successMessage,
  ariaLabel,
  submitDisabled = false,
  otherSubmits = false,
}: ActionFormProps) {
  const [state, formAction, pending] = useActionState(action, EMPTY_FORM_STATE);
  const form = useRef<HTMLFormElement>(null);
  // Until the page's script has run, a submit would be the browser's own (a GET of the same page,
  // losing what was typed): the submit buttons wait, and `data-ready` tells tests the form is live.
  const ready = useReady();
  useEffect(() => {
    if (state.ok && resetOnSuccess) form.current?.reset();
  }, [state, resetOnSuccess]);
  return (
    <StateContext.Provider value={state}>
      <PendingContext.Provider value={pending}>
        <ReadyContext.Provider value={ready}>
          <form
            ref={form}
            className={className}
            aria-label={ariaLabel}
            data-ready={ready ? "" : undefined}
            noValidate
            onSubmit={(event) => {
              event.preventDefault();
              if (confirm && !window.confirm(confirm)) return;
              // With the button that submitted it ("keep my answer" and a server-side confirmation carry their values).
              const data = new FormData(event.currentTarget, (event.nativeEvent as SubmitEvent).submitter);
              startTransition(() => formAction(data));
            }}
          >
            {otherSubmits ? <button type="submit" hidden tabIndex={-1} aria-hidden="true" disabled={!ready || pending || submitDisabled} /> : null}
            {state.message && !state.ok ? (
              <ErrorBanner>{state.message}</ErrorBanner>
            ) : null}
            {children}
            {state.ok && (state.message || successMessage) ? (
              <p className="notice" role="status">
                {state.message ?? successMessage}
              </p>
            ) : null}
            {state.confirm ? (
              <div className="card confirm-step" role="alertdialog" aria-label="Confirm before saving" data-confirm={state.confirm.value}>
                <p>{state.confirm.text}</p>
                <p className="hint">Nothing is saved until you confirm. Change the value above and submit again to record a different one.</p>
                <button type="submit" name={state.confirm.field} value={state.confirm.value} disabled={pending}>
                  {state.confirm.submitLabel}
                </button>
              </div>
            ) : null}
            {state.secret ? <SecretOnce label={state.secret.label} value={state.secret.value} /> : null}
            {state.secrets?.map((s) => <SecretOnce key={s.value} label={s.label} value={s.value} />)}
            <div className="actions">
              <button type="submit" className={submitClassName} disabled={!ready || pending || submitDisabled}>
                {pending ? (pendingLabel ?? "Saving…") : submitLabel}
              </button>
              {state.ok === false && state.fieldErrors && Object.keys(state.fieldErrors).length > 0 ? (
                <span className="field-error">Not saved: see the messages in red above.</span>
              ) : null}
            </div>
          </form>
        </ReadyContext.Provider>
      </PendingContext.Provider>
    </StateContext.Provider>
  );
}

/**
 * A further submit button inside an <ActionForm> whose markup the page draws (e.g. "keep my
 * answer", with its name and value): like the form's own button, it is disabled until the form's
 * script has run and while the form is saving, and carries `data-ready` once it is live.
 */
export function SubmitButton({ children, ...props }: Omit<ComponentProps<"button">, "type" | "disabled"> & { children: ReactNode }) {
  const ready = useContext(ReadyContext);
  const pending = useContext(PendingContext);
  return (
    <button {...props} type="submit" disabled={!ready || pending} data-ready={ready ? "" : undefined}>
      {children}
    </button>
  );
}

/** The errors the last submission returned for one field (nothing when there are none). */
export function FieldError({ name }: { name: string }) {
  const state = useContext(StateContext);
  const errors = state.fieldErrors?.[name];
  if (!errors || errors.length === 0) return null;
  return (
    <span className="field-error" role="alert" data-field={name}>
      {errors.join(" ")}
    </span>
  );
}

/** A secret shown once: it cannot be displayed again after the page is left. */
export function SecretOnce({ label, value }: { label: string; value: string }) {
  return (
    <div className="card secret-once" data-secret-label={label}>
      <strong>{label}</strong>
      <span className="hint">Copy it now: it is shown only this once and cannot be displayed again.</span>
      <code className="secret">{value}</code>
      <CopyButton text={value} />
    </div>
  );
}
