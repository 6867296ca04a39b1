"use client";
/**
 * Buttons that copy a text to the clipboard, or save it as a file, in the browser. The copy
 * button says whether it worked (the clipboard needs a secure context: https or localhost);
 * when it cannot, the text stays on the page to be selected by hand.
 */
import { useState } from "react";

export function CopyButton({ text, label = "Copy" }: { text: string; label?: string }) {
  const [done, setDone] = useState<"" | "copied" | "failed">("");
  return (
    <button
      type="button"
      className="secondary"
      data-copy-state={done || "ready"}
      onClick={() => {
        navigator.clipboard?.writeText(text).then(
          () => setDone("copied"),
          () => setDone("failed"),
        ) ?? setDone("failed");
      }}
    >
      {done === "copied" ? "Copied" : done === "failed" ? "Copy failed: select the text" : label}
    </button>
  );
}

/** Saves `text` as the file `filename` (type `type`). */
export function DownloadButton({ text, filename, type = "text/plain", label = "Download" }: { text: string; filename: string; type?: string; label?: string }) {
  return (
    <button
      type="button"
      className="secondary"
      onClick={() => {
        const url = URL.createObjectURL(new Blob([text], { type }));
        const a = document.createElement("a");
        a.href = url;
        a.download = filename;
        a.click();
        setTimeout(() => URL.revokeObjectURL(url), 0);
      }}
    >
      {label}
    </button>
  );
}
