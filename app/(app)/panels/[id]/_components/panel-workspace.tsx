"use client";
import { useQuery, useQueryClient } from "@tanstack/react-query";
import { useSearchParams } from "next/navigation";
import { useEffect, useRef, useState, type KeyboardEvent } from "react";
import { fetchJson } from "@/components/api-client";
import { queryKeys, type DatasetItem, type MemberView, type PanelView, type RevisionView, type ThreadAnchor } from "@/components/figures/api";
import type { ChartAnchor, PickMode } from "@/components/figures/chart-anchors";
import { PanelChartLazy } from "@/components/figures/panel-chart-lazy";
import { ReviewStateBadge } from "@/components/figures/review-state";
import { PX_PER_MM } from "@/components/figures/vega-render";
import { choicesFromRevision, type BindingChoice } from "@/components/figures/use-preview-data";
import { ReviewColumn } from "@/components/panel-review/review-column";
import { RunParameters } from "@/components/panel-review/run-parameters";
import { roleAllows } from "@/lib/authz/policy";
import { shortHash } from "@/lib/data/format";
import { useThreads } from "@/components/panel-review/use-threads";
import { BindingsTab } from "./bindings-tab";
import { BuilderTab } from "./builder-tab";
import { RevisionsTab } from "./revisions-tab";
import { SpecEditorTab } from "./spec-editor-tab";
import { RelativeTime } from "@/components/review/relative-time";

type Tab = "builder" | "editor" | "bindings" | "revisions";
const TABS: Array<{ id: Tab; label: string }> = [
  { id: "builder", label: "Builder" },
  { id: "editor", label: "Spec editor" },
  { id: "bindings", label: "Bindings" },
  { id: "revisions", label: "Revisions" },
];
const ZOOMS = [100, 125, 150, 200];
/** The zoom the panel opens at, shrunk to the width there is ("fit"). */
const FIT_MAX = 1.5;

/** The width of an element's content box, followed as it changes (null until measured). */
function useContentWidth() {
  const [el, ref] = useState<HTMLDivElement | null>(null);
  const [width, setWidth] = useState<number | null>(null);
  useEffect(() => {
    if (!el) return;
    const ro = new ResizeObserver(() => setWidth(el.clientWidth));
    ro.observe(el);
    return () => ro.disconnect();
  }, [el]);
  return [ref, width] as const;
}

/** The panel workspace: the current revision in the centre, builder / editor / bindings / revisions below, the review beside. */
export function PanelWorkspace({
  initial,
  widthMm,
  members,
  datasets,
  me,
}: {
  initial: PanelView;
  widthMm: number;
  members: MemberView[];
  datasets: DatasetItem[];
  me: { id: string; name: string };
}) {
  const qc = useQueryClient();
  const { data: panel = initial } = useQuery({
    queryKey: queryKeys.panel(initial.id),
    queryFn: () => fetchJson<PanelView>(`/api/panels/${initial.id}`),
    initialData: initial,
    refetchInterval: 30_000,
  });
  const rev = panel.currentRevision;
  const editable = roleAllows(panel.role, "figure.edit");
  // Coming back from the fit page (`?tab=builder`) opens the builder with the new run chosen.
  const asked = useSearchParams().get("tab");
  const [tab, setTab] = useState<Tab>(!editable ? "revisions" : asked === "builder" || !rev ? "builder" : "editor");
  const [zoomChoice, setZoomChoice] = useState<"fit" | number>("fit");
  const [chartBox, chartBoxWidth] = useContentWidth();
  const naturalPx = widthMm * PX_PER_MM;
  const fitZoom = chartBoxWidth ? Math.min(FIT_MAX, chartBoxWidth / naturalPx) : FIT_MAX;
  const zoom = zoomChoice === "fit" ? fitZoom : zoomChoice / 100;
  const shownTabs = TABS.filter((t) => editable || t.id !== "builder");
  const tabButtons = useRef<Record<string, HTMLButtonElement | null>>({});
  /** WAI-ARIA tabs: arrows, Home and End move between the tabs and select the one reached. */
  function onTabKey(e: KeyboardEvent<HTMLDivElement>) {
    const at = shownTabs.findIndex((t) => t.id === tab);
    const next =
      e.key === "ArrowRight"
        ? (at + 1) % shownTabs.length
        : e.key === "ArrowLeft"
          ? (at - 1 + shownTabs.length) % shownTabs.length
          : e.key === "Home"
            ? 0
            : e.key === "End"
              ? shownTabs.length - 1
              : -1;
    if (next < 0) return;
    e.preventDefault();
    const id = shownTabs[next].id;
    setTab(id);
    tabButtons.current[id]?.focus();
  }
  const [base, setBase] = useState<string | null>(initial.currentRevision?.id ?? null);
  const [text, setText] = useState(initial.currentRevision ? JSON.stringify(initial.currentRevision.spec, null, 2) : "");
  const [choices, setChoices] = useState<Record<string, BindingChoice>>(() => choicesFromRevision(initial.currentRevision));
  const [pickMode, setPickMode] = useState<PickMode>("none");
  const [draftAnchor, setDraftAnchor] = useState<ThreadAnchor | null>(null);
  const threads = useThreads(panel.id).data ?? [];

  const anchors: ChartAnchor[] = threads.flatMap((t, i) =>
    t.anchor && t.status === "open"
      ? [
          {
            id: t.id,
            anchor: t.anchor,
            stale: rev ? t.revisionNumber !== rev.number : false,
            label: `#${i + 1}${rev && t.revisionNumber !== rev.number ? ` · written on revision ${t.revisionNumber}` : ""}`,
          },
        ]
      : [],
  );
  if (draftAnchor) anchors.push({ id: "draft", anchor: draftAnchor, label: "new comment", draft: true });

  function onSaved(r: RevisionView) {
    setBase(r.id);
    setChoices(choicesFromRevision(r));
    setText(JSON.stringify(r.spec, null, 2));
    qc.setQueryData(queryKeys.revision(r.id), r);
    for (const key of [queryKeys.panel(panel.id), queryKeys.revisions(panel.id), queryKeys.figure(panel.figureId), queryKeys.trace(panel.figureId)])
      void qc.invalidateQueries({ queryKey: key });
  }

  return (
    <>
      <header className="mb-5 flex flex-wrap items-end justify-between gap-3 border-b border-rule pb-3">
        <div>
          <h1 className="text-2xl font-semibold tracking-tight">
            <span className="font-bold">{panel.letter}</span> · {panel.title || "Untitled panel"}
          </h1>
          <p className="mt-1 flex flex-wrap items-center gap-2 text-sm text-muted">
            <ReviewStateBadge state={panel.reviewState} />
            <span>
              Figure {panel.figure.number} · {panel.figure.title}
            </span>
            <span className="tabular">· {Math.round(widthMm * 10) / 10} mm wide</span>
          </p>
        </div>
      </header>
      {rev && base !== rev.id ? (
        <p role="alert" className="mb-4 rounded-sm border border-warn bg-[#fbf4e6] p-3 text-sm text-warn">
          <span aria-hidden>△ </span>Revision {rev.number} was saved since you opened this panel; the editor still holds your version.{" "}
          <button type="button" className="underline" onClick={() => window.location.reload()}>
            Reload
          </button>
        </p>
      ) : null}
      {/* One grid, in reading order chart → review → workspace tabs: below lg the review comes right under the
          chart; from lg up it is the right-hand column beside both. */}
      <div className="grid grid-cols-1 gap-6 lg:grid-cols-[minmax(0,1fr)_340px] lg:grid-rows-[auto_1fr]">
        <section aria-label="Current revision" className="min-w-0 rounded-sm border border-rule bg-sheet p-4 lg:col-start-1 lg:row-start-1">
          {rev ? (
            <>
              <div className="mb-2 flex flex-wrap items-center gap-2 text-xs text-muted">
                <p>
                  <b className="text-ink">Revision {rev.number}</b>
                  {rev.message ? ` · “${rev.message}”` : ""} · <RelativeTime at={rev.createdAt} /> ·{" "}
                  <code title={rev.contentHash}>{shortHash(rev.contentHash)}</code>
                </p>
                <label className="ml-auto flex items-center gap-1">
                  shown at
                  <select
                    className="rounded-sm border border-rule bg-white px-1 py-0.5"
                    value={String(zoomChoice)}
                    onChange={(e) => setZoomChoice(e.target.value === "fit" ? "fit" : Number(e.target.value))}
                    aria-label="Zoom of the panel"
                  >
                    <option value="fit">fit to width ({Math.round(fitZoom * 100)} %)</option>
                    {ZOOMS.map((z) => (
                      <option key={z} value={z}>
                        {z === 100 ? "100 % (print size)" : `${z} %`}
                      </option>
                    ))}
                  </select>
                </label>
              </div>
              <div ref={chartBox} className="overflow-x-auto">
                <PanelChartLazy
                  spec={rev.spec}
                  revisionId={rev.id}
                  widthMm={widthMm}
                  zoom={zoom}
                  anchors={anchors}
                  pickMode={pickMode}
                  onPick={(a) => {
                    setDraftAnchor(a);
                    setPickMode("none");
                  }}
                  label={`Panel ${panel.letter}, revision ${rev.number}`}
                />
              </div>
              <RunParameters bound={rev.bound} />
            </>
          ) : (
            <p className="text-sm text-muted">
              No revision yet.{" "}
              {editable ? "Build one below: choose a template, bind the data, generate the spec and save it." : "The authors have not saved one."}
            </p>
          )}
        </section>

        <aside aria-label="Review" className="min-w-0 lg:col-start-2 lg:row-span-2 lg:row-start-1">
          <ReviewColumn
            panel={panel}
            members={members}
            me={me}
            pickMode={pickMode}
            onPickMode={setPickMode}
            draftAnchor={draftAnchor}
            onDraftAnchor={setDraftAnchor}
          />
        </aside>

        <section className="min-w-0 lg:col-start-1 lg:row-start-2">
          <div role="tablist" aria-label="Panel workspace" className="flex gap-1 border-b border-rule" onKeyDown={onTabKey}>
            {shownTabs.map((t) => (
              <button
                key={t.id}
                ref={(el) => {
                  tabButtons.current[t.id] = el;
                }}
                role="tab"
                type="button"
                id={`tab-${t.id}`}
                aria-controls={`tabpanel-${t.id}`}
                aria-selected={tab === t.id}
                tabIndex={tab === t.id ? 0 : -1}
                onClick={() => setTab(t.id)}
                className={`-mb-px whitespace-nowrap rounded-t-sm border px-2.5 py-1.5 text-sm sm:px-3 ${tab === t.id ? "border-rule border-b-paper bg-paper font-semibold" : "border-transparent text-muted hover:text-ink"}`}
              >
                {t.label}
              </button>
            ))}
          </div>
          <div className="pt-4">
            {editable ? (
              <div role="tabpanel" id="tabpanel-builder" aria-labelledby="tab-builder" tabIndex={0} hidden={tab !== "builder"}>
                <BuilderTab
                  manuscriptId={panel.manuscriptId}
                  datasets={datasets}
                  defaultWidthMm={widthMm}
                  panelId={panel.id}
                  revision={rev}
                  baseRevisionId={base}
                  onSaved={onSaved}
                  onGenerate={(t, c) => {
                    setText(t);
                    setChoices(c);
                    setTab("editor");
                  }}
                />
              </div>
            ) : null}
            <div role="tabpanel" id="tabpanel-editor" aria-labelledby="tab-editor" tabIndex={0} hidden={tab !== "editor"}>
              <SpecEditorTab
                panelId={panel.id}
                text={text}
                onText={setText}
                choices={choices}
                editable={editable}
                widthMm={widthMm}
                onSaved={onSaved}
                revision={rev ? { id: rev.id, number: rev.number, bindings: rev.bindings } : null}
                baseRevisionId={base}
              />
            </div>
            {/* Every tab's panel exists (so each aria-controls points at one); bindings and revisions fetch, so their content mounts only while shown. */}
            <div role="tabpanel" id="tabpanel-bindings" aria-labelledby="tab-bindings" tabIndex={0} hidden={tab !== "bindings"}>
              {tab === "bindings" ? (
                <BindingsTab figureId={panel.figureId} panelId={panel.id} revision={rev ? rev : null} editable={editable} onSaved={onSaved} />
              ) : null}
            </div>
            <div role="tabpanel" id="tabpanel-revisions" aria-labelledby="tab-revisions" tabIndex={0} hidden={tab !== "revisions"}>
              {tab === "revisions" ? <RevisionsTab panelId={panel.id} widthMm={widthMm} /> : null}
            </div>
          </div>
        </section>
      </div>
    </>
  );
}
