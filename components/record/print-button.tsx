"use client";
/** Opens the browser's print dialogue; "Save as PDF" there makes the PDF (no PDF library involved). */
export function PrintButton() {
  return (
    <button type="button" onClick={() => window.print()} className="rounded bg-amber-500 px-3 py-1.5 text-sm font-semibold text-black">
      Print or save as PDF
    </button>
  );
}
