"use client";
/**
 * Live progress of the open round for the organiser: polls the JSON API's progress resource
 * every few seconds with the session cookie (no manual reload) and shows who has answered, under pseudonyms. "Reveal names" calls a
 * server action that writes an audit event before returning the names; the names are kept in
 * this page's memory only and are gone on the next visit.
 */
import { useEffect, useRef, useState, useTransition } from "react";
import { useRouter } from "next/navigation";
import ErrorBanner from "./error-banner";
import { useReady } from "./use-ready";
import { formatDateTime } from "./format";

/** What GET /api/v1/panels/{panelId}/progress returns (ProgressView, lib/panels/rounds.ts). */
export interface ProgressSnapshot {
  readonly round: { readonly number: number; readonly status: string; readonly deadline: string | null } | null;
  readonly questionCount: number;
  readonly invited: number;
  /** Panelists who have answered every question. */
  readonly answeredAll: number;
  readonly answeredSome: number;
  readonly panelists: readonly { readonly pseudonym: string; readonly questionsAnswered: number; readonly lastAnswerAt: string | null }[];
}

export type RevealAction = (reason: string) => Promise<{ ok: boolean; message?: string; names?: Record<string, string> }>;

export default function LiveProgress({
  url,
  initial,
  checkedAt: checkedAtInitial,
  reveal,
  intervalMs = 3000,
}: {
  url: string;
  initial: ProgressSnapshot;
  /** When the server read `initial`. */
  checkedAt: string;
  reveal: RevealAction | null;
  intervalMs?: number;
}) {
  const [snapshot, setSnapshot] = useState(initial);
  const [checkedAt, setCheckedAt] = useState(checkedAtInitial);
  const [error, setError] = useState<string | null>(null);
  const [names, setNames] = useState<Record<string, string> | null>(null);
  const [revealMessage, setRevealMessage] = useState<string | null>(null);
  const [pending, startTransition] = useTransition();
  const ready = useReady();
  const router = useRouter();
  const lastStatus = useRef(initial.round?.status ?? null);
  const [reason, setReason] = useState("");

  useEffect(() => {
    let stopped = false;
    const tick = async () => {
      try {
        const res = await fetch(url, { cache: "no-store", headers: { accept: "application/json" } });
        if (!res.ok) throw new Error(`the server answered ${res.status}`);
        const next = (await res.json()) as ProgressSnapshot;
        if (stopped) return;
        setSnapshot(next);
        setCheckedAt(new Date().toISOString());
        setError(null);
        const status = next.round?.status ?? null;
        if (status !== lastStatus.current) {
          lastStatus.current = status;
          router.refresh();
        }
      } catch (e) {
        if (!stopped) setError(`Progress could not be updated (${(e as Error).message}); retrying.`);
      }
    };
    const timer = setInterval(tick, intervalMs);
    return () => {
      stopped = true;
      clearInterval(timer);
    };
  }, [url, intervalMs, router]);

  const share = snapshot.invited === 0 ? 0 : snapshot.answeredAll / snapshot.invited;
  return (
    <div className="live-progress" aria-live="polite">
      <p>
        <strong data-testid="progress-count">
          {snapshot.answeredAll}/{snapshot.invited}
        </strong>{" "}
        panelists have answered all {snapshot.questionCount} question{snapshot.questionCount === 1 ? "" : "s"} of round{" "}
        {snapshot.round?.number ?? "—"}
        {snapshot.round?.deadline ? ` (closes by itself at ${formatDateTime(snapshot.round.deadline)})` : ""}.
        {snapshot.answeredSome > snapshot.answeredAll ? ` ${snapshot.answeredSome - snapshot.answeredAll} more have answered some.` : ""}
      </p>
      <div className="progress-bar" role="progressbar" aria-label={`Panelists who have answered every question of round ${snapshot.round?.number ?? "—"}`} aria-valuetext={`${snapshot.answeredAll} of ${snapshot.invited}`} aria-valuemin={0} aria-valuemax={snapshot.invited} aria-valuenow={snapshot.answeredAll}>
        <span style={{ width: `${Math.round(share * 100)}%` }} />
      </div>
      <p className="hint">Updated every {Math.round(intervalMs / 1000)} seconds; last checked {formatDateTime(checkedAt)}.</p>
      {error ? <ErrorBanner>{error}</ErrorBanner> : null}
      <table>
        <thead>
          <tr>
            <th>Panelist</th>
            {names ? <th>Name</th> : null}
            <th className="num">Questions answered</th>
            <th>Last answer</th>
          </tr>
        </thead>
        <tbody>
          {snapshot.panelists.map((p) => (
            <tr key={p.pseudonym} data-pseudonym={p.pseudonym}>
              <td>{p.pseudonym}</td>
              {names ? <td>{names[p.pseudonym] ?? "—"}</td> : null}
              <td className="num">
                {p.questionsAnswered}/{snapshot.questionCount}
              </td>
              <td>{p.lastAnswerAt ? formatDateTime(p.lastAnswerAt) : "not yet"}</td>
            </tr>
          ))}
        </tbody>
      </table>
      {reveal && !names ? (
        <form
          className="actions"
          data-ready={ready ? "" : undefined}
          onSubmit={(event) => {
            event.preventDefault();
            if (reason.trim().length === 0) {
              setRevealMessage("Give a reason: it is recorded in the audit log with the reveal.");
              return;
            }
            const ok = window.confirm(
              "Revealing names is recorded in the panel's audit log with your name, the time and your reason. Pseudonyms keep anyone's answer from being read in the light of who gave it. Reveal the names?",
            );
            if (!ok) return;
            startTransition(async () => {
              const result = await reveal(reason);
              if (result.ok && result.names) {
                setNames(result.names);
                setRevealMessage("Names revealed; this was recorded in the audit log.");
              } else setRevealMessage(result.message ?? "The names could not be revealed.");
            });
          }}
        >
          <label style={{ flex: "1 1 16rem", margin: 0 }}>
            Reason for revealing names <span className="hint">Recorded in the audit log before any name is shown.</span>
            <input name="reason" value={reason} onChange={(e) => setReason(e.target.value)} maxLength={500} />
          </label>
          <button type="submit" className="secondary" disabled={!ready || pending}>
            Reveal names (logged)
          </button>
        </form>
      ) : null}
      {revealMessage ? <p className="notice">{revealMessage}</p> : null}
    </div>
  );
}
