"use client";
/** Prints the page (the print stylesheet in app/globals.css gives the paper layout). */
export default function PrintButton({ label = "Print" }: { label?: string }) {
  return (
    <button type="button" className="secondary no-print" onClick={() => window.print()}>
      {label}
    </button>
  );
}
