"use client";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import Link from "next/link";
import { useState, type FormEvent } from "react";
import { sendJson } from "@/components/api-client";
import { queryKeys, type FigureView } from "@/components/figures/api";
import { PanelThumbnail } from "@/components/figures/figure-thumbnail";
import { ReviewStateBadge } from "@/components/figures/review-state";
import { Button, Field, Select, TextInput } from "@/components/ui";

/** Add a panel and change the order (letters follow the order). */
export function PanelManager({ figure, editable }: { figure: FigureView; editable: boolean }) {
  const qc = useQueryClient();
  const [title, setTitle] = useState("");
  const [span, setSpan] = useState("1");
  const refresh = () => qc.invalidateQueries({ queryKey: queryKeys.figure(figure.id) });
  const add = useMutation({
    mutationFn: () => sendJson(`/api/figures/${figure.id}/panels`, "POST", { title: title || undefined, colSpan: Number(span) }),
    onSuccess: () => {
      setTitle("");
      return refresh();
    },
  });
  const order = useMutation({
    mutationFn: (panelIds: string[]) => sendJson<FigureView>(`/api/figures/${figure.id}/order`, "POST", { panelIds }),
    onSuccess: (f) => qc.setQueryData(queryKeys.figure(figure.id), f),
  });
  const move = (i: number, by: -1 | 1) => {
    const ids = figure.panels.map((p) => p.id);
    [ids[i], ids[i + by]] = [ids[i + by], ids[i]];
    order.mutate(ids);
  };
  const submit = (e: FormEvent) => {
    e.preventDefault();
    add.mutate();
  };

  return (
    <div>
      <ol className="divide-y divide-rule text-sm" aria-label="Panels in order">
        {figure.panels.map((p, i) => (
          <li key={p.id} className="flex items-center gap-2 py-1.5">
            <b className="w-5">{p.letter}</b>
            <PanelThumbnail panel={p} width={72} height={48} />
            <span className="flex min-w-0 flex-1 flex-col items-start gap-0.5">
              <Link href={`/panels/${p.id}`} className="max-w-full truncate underline">
                {p.title || "untitled"}
              </Link>
              <span className="flex items-center gap-1.5 text-xs text-muted">
                <ReviewStateBadge state={p.reviewState} />
                {p.colSpan > 1 ? `spans ${p.colSpan}` : ""}
              </span>
            </span>
            {editable ? (
              <span className="flex gap-1">
                <button
                  type="button"
                  className="h-6 w-6 rounded-sm border border-rule disabled:opacity-30"
                  disabled={i === 0 || order.isPending}
                  onClick={() => move(i, -1)}
                  aria-label={`Move panel ${p.letter} up`}
                >
                  ↑
                </button>
                <button
                  type="button"
                  className="h-6 w-6 rounded-sm border border-rule disabled:opacity-30"
                  disabled={i === figure.panels.length - 1 || order.isPending}
                  onClick={() => move(i, 1)}
                  aria-label={`Move panel ${p.letter} down`}
                >
                  ↓
                </button>
              </span>
            ) : null}
          </li>
        ))}
      </ol>
      {order.isError ? (
        <p role="alert" className="mt-1 text-sm text-bad">
          ✕ {order.error.message}
        </p>
      ) : null}
      {editable ? (
        <form onSubmit={submit} aria-label="Add panel" className="mt-3 space-y-2 border-t border-rule pt-3">
          <div className="grid grid-cols-[minmax(0,1fr)_5.5rem] gap-2">
            <Field label="Panel title">
              <TextInput value={title} onChange={(e) => setTitle(e.target.value)} placeholder="optional" />
            </Field>
            <Field label="Span">
              <Select value={span} onChange={(e) => setSpan(e.target.value)}>
                {Array.from({ length: figure.columns }, (_, k) => (
                  <option key={k + 1} value={k + 1}>
                    {k + 1} col
                  </option>
                ))}
              </Select>
            </Field>
          </div>
          <Button type="submit" variant="quiet" disabled={add.isPending}>
            {add.isPending ? "Adding…" : "Add panel"}
          </Button>
          {add.isError ? (
            <p role="alert" className="text-sm text-bad">
              ✕ {add.error.message}
            </p>
          ) : null}
        </form>
      ) : null}
    </div>
  );
}
