"use client";
import { useEffect, useState } from "react";

/**
 * Whether the page's script has run for this component (false in the server's HTML and until
 * hydration). A form's submit buttons stay disabled until then: a click before it would be the
 * browser's own submit, a GET of the same page with the fields in its address (what was typed,
 * a password too, in the browser's history), and the action would be lost. Forms mark the state
 * with `data-ready` for tests to wait on.
 */
export function useReady(): boolean {
  const [ready, setReady] = useState(false);
  useEffect(() => setReady(true), []);
  return ready;
}
