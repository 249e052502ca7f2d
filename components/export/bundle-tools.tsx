"use client";
import Link from "next/link";
import { useState, type FormEvent } from "react";
import { ApiError, messageFromBody } from "@/components/api-client";
import { Button, Field, Notice } from "@/components/ui";

interface CheckRow {
  item: string;
  check: string;
  match: boolean;
  detail: string;
}
interface CheckReport {
  ok: boolean;
  bundleSha256: string;
  tolerances: Record<string, string>;
  rows: CheckRow[];
}
interface ImportReport {
  figureId: string;
  figureNumber: number;
  bundleSha256: string;
  datasets: Array<{ id: string; name: string; versions: number }>;
  analyses: number;
  panels: number;
  note: string;
}

/** POSTs the chosen zip as the multipart `file` part; an error answer throws with the server's message. */
async function sendZip<T>(url: string, file: File): Promise<T> {
  const form = new FormData();
  form.set("file", file);
  const res = await fetch(url, { method: "POST", body: form });
  const text = await res.text();
  if (!res.ok) throw new ApiError(res.status, messageFromBody(res.status, text));
  return JSON.parse(text) as T;
}

function useZipForm<T>(url: string) {
  const [file, setFile] = useState<File | null>(null);
  const [busy, setBusy] = useState(false);
  const [result, setResult] = useState<T | null>(null);
  const [error, setError] = useState<string | null>(null);
  async function submit(e: FormEvent) {
    e.preventDefault();
    if (!file) return;
    setBusy(true);
    setError(null);
    setResult(null);
    try {
      setResult(await sendZip<T>(url, file));
    } catch (err) {
      setError((err as Error).message);
    }
    setBusy(false);
  }
  return { file, setFile, busy, result, error, submit };
}

/** Check a bundle from its own contents: every file, parse, fit and panel, with the tolerance of each check. */
export function CheckBundle() {
  const f = useZipForm<CheckReport>("/api/bundles/verify");
  const failed = f.result?.rows.filter((r) => !r.match) ?? [];
  return (
    <form onSubmit={(e) => void f.submit(e)} className="space-y-3">
      <Field label="Bundle to check (.zip)" hint="A bundle exported from any Prooflight figure; nothing is stored.">
        <input type="file" accept=".zip,application/zip" className="text-sm" onChange={(e) => f.setFile(e.target.files?.[0] ?? null)} />
      </Field>
      <Button type="submit" disabled={!f.file || f.busy}>
        {f.busy ? "Checking…" : "Check the bundle"}
      </Button>
      {f.error ? <Notice ok={false}>{f.error}</Notice> : null}
      {f.result ? (
        <>
          <Notice ok={f.result.ok}>
            {f.result.ok
              ? `Every one of the ${f.result.rows.length} checks matches.`
              : `${failed.length} of ${f.result.rows.length} checks do not match: ${failed
                  .slice(0, 3)
                  .map((r) => r.item)
                  .join(", ")}${failed.length > 3 ? " …" : ""}.`}
          </Notice>
          <p className="text-xs text-muted">
            Bundle SHA-256 <span className="font-mono">{f.result.bundleSha256}</span>
          </p>
          <div className="overflow-x-auto">
            <table className="w-full border border-rule bg-sheet text-sm" aria-label="Bundle check">
              <thead className="bg-paper text-left text-xs uppercase tracking-wide text-muted">
                <tr>
                  <th className="px-2.5 py-2">Item</th>
                  <th className="px-2.5 py-2">Check</th>
                  <th className="px-2.5 py-2">Result</th>
                  <th className="px-2.5 py-2">Detail</th>
                </tr>
              </thead>
              <tbody className="divide-y divide-rule">
                {f.result.rows.map((r, i) => (
                  <tr key={i}>
                    <td className="px-2.5 py-1.5 font-mono text-xs">{r.item}</td>
                    <td className="px-2.5 py-1.5">{r.check}</td>
                    <td className={`whitespace-nowrap px-2.5 py-1.5 ${r.match ? "text-good" : "text-bad"}`}>
                      <span aria-hidden>{r.match ? "✓ " : "✕ "}</span>
                      {r.match ? "match" : "mismatch"}
                    </td>
                    <td className="px-2.5 py-1.5 text-xs">{r.detail}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          <details className="text-xs text-muted">
            <summary>Tolerances</summary>
            <ul className="mt-1 list-disc pl-5">
              {Object.entries(f.result.tolerances).map(([k, v]) => (
                <li key={k}>
                  <span className="font-semibold">{k}</span>: {v}
                </li>
              ))}
            </ul>
          </details>
        </>
      ) : null}
    </form>
  );
}

/** Import a bundle into this manuscript: checked in full first, then its data, fits and figure recreated. */
export function ImportBundle({ manuscriptId }: { manuscriptId: string }) {
  const f = useZipForm<ImportReport>(`/api/manuscripts/${manuscriptId}/bundles/import`);
  return (
    <form onSubmit={(e) => void f.submit(e)} className="space-y-3">
      <Field label="Bundle to import (.zip)" hint="It is checked in full first; a bundle that does not check out imports nothing.">
        <input type="file" accept=".zip,application/zip" className="text-sm" onChange={(e) => f.setFile(e.target.files?.[0] ?? null)} />
      </Field>
      <Button type="submit" disabled={!f.file || f.busy}>
        {f.busy ? "Checking and importing…" : "Import the bundle"}
      </Button>
      {f.error ? <Notice ok={false}>{f.error}</Notice> : null}
      {f.result ? (
        <>
          <Notice ok>
            Imported Figure {f.result.figureNumber} with {f.result.panels} panel{f.result.panels === 1 ? "" : "s"}, {f.result.datasets.length} dataset
            {f.result.datasets.length === 1 ? "" : "s"} and {f.result.analyses} fit{f.result.analyses === 1 ? "" : "s"}.
          </Notice>
          <p className="text-sm text-muted">{f.result.note}</p>
          <Link href={`/figures/${f.result.figureId}`} className="text-sm text-accent underline">
            Open the imported Figure {f.result.figureNumber}
          </Link>
        </>
      ) : null}
    </form>
  );
}
