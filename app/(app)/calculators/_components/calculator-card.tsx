"use client";
import { useState, type FormEvent } from "react";
import { sendJson } from "@/components/api-client";
import { Button, Notice } from "@/components/ui";
import { formatNumber } from "@/lib/data/format";

interface Io {
  name: string;
  label: string;
  unit: string;
  default?: number;
}
export interface CalculatorView {
  id: string;
  title: string;
  formula: string;
  assumptions: string[];
  source: string;
  inputs: Io[];
  outputs: Io[];
}

/** One calculator: inputs with units, the formula, the answer, its warnings and assumptions. */
export function CalculatorCard({ calculator: c }: { calculator: CalculatorView }) {
  const [result, setResult] = useState<{ outputs: Record<string, number>; warnings: string[] } | null>(null);
  const [error, setError] = useState<string | null>(null);

  async function submit(e: FormEvent<HTMLFormElement>) {
    e.preventDefault();
    const form = new FormData(e.currentTarget);
    const inputs = Object.fromEntries(c.inputs.map((i) => [i.name, Number(form.get(i.name))]));
    try {
      setResult(await sendJson<{ outputs: Record<string, number>; warnings: string[] }>(`/api/calculators/${c.id}`, "POST", { inputs }));
      setError(null);
    } catch (err) {
      setError((err as Error).message);
      setResult(null);
    }
  }

  return (
    <section className="rounded-sm border border-rule bg-sheet p-5" aria-labelledby={`calc-${c.id}`}>
      <h2 id={`calc-${c.id}`} className="font-semibold">
        {c.title}
      </h2>
      <p className="mt-1 font-mono text-xs text-muted">{c.formula}</p>
      <form onSubmit={(e) => void submit(e)} className="mt-4 grid grid-cols-2 gap-3">
        {c.inputs.map((i) => (
          <label key={i.name} className="text-sm">
            <span className="mb-1 block font-medium">
              {i.label} <span className="text-muted">({i.unit})</span>
            </span>
            <input
              name={i.name}
              type="number"
              step="any"
              required
              defaultValue={i.default}
              className="w-full rounded-sm border border-rule bg-white px-2 py-1.5 text-sm"
            />
          </label>
        ))}
        <div className="col-span-2">
          <Button type="submit" variant="quiet">
            Calculate
          </Button>
        </div>
      </form>
      {error ? <Notice ok={false}>{error}</Notice> : null}
      {result ? (
        <div className="mt-3" data-testid={`result-${c.id}`}>
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
            {c.outputs.map((o) => (
              <div key={o.name} className="contents">
                <dt className="text-muted">{o.label}</dt>
                <dd className="tabular font-medium">
                  {formatNumber(result.outputs[o.name], 6)} {o.unit}
                </dd>
              </div>
            ))}
          </dl>
          {result.warnings.map((w) => (
            <p key={w} className="mt-2 text-xs">
              <span aria-hidden>⚠ </span>
              {w}
            </p>
          ))}
        </div>
      ) : null}
      <details className="mt-3 text-xs text-muted">
        <summary className="cursor-pointer">Assumptions and source</summary>
        <ul className="mt-2 list-disc space-y-1 pl-4">
          {c.assumptions.map((a) => (
            <li key={a}>{a}</li>
          ))}
        </ul>
        <p className="mt-2">Source: {c.source}</p>
      </details>
    </section>
  );
}
