"use client";
import Link from "next/link";
import { useState } from "react";
import type { FigureView } from "@/components/figures/api";
import { Field, Select } from "@/components/ui";
import { describeHouseStyle } from "@/lib/figures/house-style";

const VECTOR = [
  { query: "format=svg", label: "SVG, text as outlines (needs no fonts)" },
  { query: "format=svg&text=embedded", label: "SVG, editable text with the fonts embedded" },
  { query: "format=pdf", label: "PDF (vector, fonts embedded)" },
];
const DATA = [
  { query: "format=xlsx", label: "Source data workbook (Excel, a sheet per panel)" },
  { query: "format=source-data", label: "Source data (CSV files, units in headers)" },
  { query: "format=bundle", label: "Reproducibility bundle" },
];
const DPI = [
  { value: "300", label: "300 dpi (photographs, colour maps)" },
  { value: "600", label: "600 dpi (combination art)" },
  { value: "1200", label: "1200 dpi (line art)" },
];

/**
 * The figure's downloads, in the manuscript's house style. A figure not signed off on its current
 * hash is exported with a strip saying so (and the same words in the PDF's Subject and the PNG's
 * Description) unless the box is cleared; leaving the mark out is recorded with the export.
 */
export function ExportLinks({ figure }: { figure: FigureView }) {
  const signedOff = figure.reviewState === "signed_off";
  const [mark, setMark] = useState(true);
  const [dpi, setDpi] = useState("300");
  const [colour, setColour] = useState("rgb");
  const suffix = signedOff || mark ? "" : "&mark=off";
  const href = (query: string) => `/api/figures/${figure.id}/export?${query}${suffix}`;
  const raster = `dpi=${dpi}&colour=${colour}`;
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
      <DownloadList items={VECTOR} href={href} />
      <fieldset className="mt-3 space-y-2 border-t border-rule pt-2 text-sm">
        <legend className="sr-only">Raster files</legend>
        <div className="grid grid-cols-1 gap-2">
          <Field label="Resolution">
            <Select value={dpi} onChange={(e) => setDpi(e.target.value)}>
              {DPI.map((d) => (
                <option key={d.value} value={d.value}>
                  {d.label}
                </option>
              ))}
            </Select>
          </Field>
          <Field label="Colour">
            <Select value={colour} onChange={(e) => setColour(e.target.value)}>
              <option value="rgb">RGB</option>
              <option value="grey">Greyscale</option>
            </Select>
          </Field>
        </div>
        <p className="flex gap-4">
          <a href={href(`format=png&${raster}`)} className="underline" download>
            PNG
          </a>
          <a href={href(`format=tiff&${raster}`)} className="underline" download>
            TIFF (LZW)
          </a>
          <span className="text-xs text-muted">on white, no transparency</span>
        </p>
      </fieldset>
      <DownloadList items={DATA} href={href} className="mt-3 border-t border-rule pt-2" />
      <p className="mt-3 text-xs text-muted">
        House style: {describeHouseStyle(figure.houseStyle)} ·{" "}
        <Link href={`/manuscripts/${figure.manuscriptId}/house-style`} className="underline">
          change
        </Link>
      </p>
      <p className="mt-1 text-xs text-muted">EPS is not offered: no maintained JavaScript library writes it; the PDF and SVG carry the same vector figure.</p>
    </>
  );
}

function DownloadList({
  items,
  href,
  className = "",
}: {
  items: Array<{ query: string; label: string }>;
  href: (query: string) => string;
  className?: string;
}) {
  return (
    <ul className={`space-y-1 text-sm ${className}`}>
      {items.map((x) => (
        <li key={x.query}>
          <a href={href(x.query)} className="underline" download>
            {x.label}
          </a>
        </li>
      ))}
    </ul>
  );
}
