"use client";
/**
 * An optional deadline picked in the browser's own time zone and sent as an ISO 8601 instant
 * (field `deadline`), which is what the round schemas expect.
 */
import { useState } from "react";

export default function DeadlineInput({ label = "Deadline (optional)" }: { label?: string }) {
  const [iso, setIso] = useState("");
  return (
    <label>
      {label} <span className="hint">The round closes by itself at this time (your local time).</span>
      <input
        type="datetime-local"
        onChange={(e) => {
          const d = e.target.value ? new Date(e.target.value) : null;
          setIso(d && !Number.isNaN(d.getTime()) ? d.toISOString() : "");
        }}
      />
      <input type="hidden" name="deadline" value={iso} />
    </label>
  );
}
