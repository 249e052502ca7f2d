"use client";
import { useState } from "react";

const EXPORTS = [
  { query: "format=svg", label: "SVG (vector)" },
  { query: "format=pdf", label: "PDF (vector)" },
  { query: "format=png&dpi=300", label: "PNG, 300 dpi" },
  { query: "format=png&dpi=600", label: "PNG, 600 dpi" },
  { query: "format=png&dpi=1200", label: "PNG, 1200 dpi (line art)" },
  { query: "format=source-data", label: "Source data (CSV, units in headers)" },
  { query: "format=bundle", label: "Reproducibility bundle" },
];

/**
 * The figure's downloads. A figure not signed off on its current hash is exported with a strip
 * saying so (and the same words in the PDF's Subject and the PNG's Description) unless the box is
 * cleared; leaving the mark out is recorded with the export.
 */
export function ExportLinks({ figureId, signedOff }: { figureId: string; signedOff: boolean }) {
  const [mark, setMark] = useState(true);
  const suffix = signedOff || mark ? "" : "&mark=off";
  return (
    <>
      {signedOff ? (
        <p className="mb-2 text-xs text-good">Signed off on this figure hash: exports carry no draft mark.</p>
      ) : (
        <label className="mb-2 flex items-start gap-2 text-xs">
          <input type="checkbox" checked={mark} onChange={(e) => setMark(e.target.checked)} className="mt-0.5" />
          <span>Mark exports “Not signed off — draft for review” (the figure is not signed off on its current hash)</span>
        </label>
      )}
      <ul className="space-y-1 text-sm">
        {EXPORTS.map((x) => (
          <li key={x.query}>
            <a href={`/api/figures/${figureId}/export?${x.query}${suffix}`} className="underline" download>
              {x.label}
            </a>
          </li>
        ))}
      </ul>
    </>
  );
}
