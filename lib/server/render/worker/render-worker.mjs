/**
 * Render worker: a child Node process (child_process.fork with IPC) that renders panels and
 * composes figures, so the parent can kill a hostile or huge spec at its time budget and the
 * child's --max-old-space-size caps its heap. A process rather than a worker thread: V8 aborts
 * the whole process on some out-of-memory paths even inside a worker with resourceLimits
 * (nodejs/node#47224), which would take the server down with the render.
 * Started by ../render-in-worker.ts from process.cwd(); plain JavaScript, no path aliases.
 *
 * Messages in:  { id, kind: "panel", spec, data, size }
 *               { id, kind: "figure", panels: [{ letter, spec, data, span? }], layout, widthMm }
 *               { id, kind: "pdf", svg, options }      (pdf-core.mjs)
 *               { id, kind: "raster", svg, options }   (png-core.mjs: print PNG or TIFF)
 * Messages out: { type: "ready" } once, then { id, ok: true, result } | { id, ok: false, error: { code, message } }
 */
import { renderSpecToSvgCore } from "./render-core.mjs";
import { alignmentPadding, isAligned } from "./align-core.mjs";
import { cellWidthMm, composeFigureCore, gridPlacement } from "./compose-core.mjs";

async function run(job) {
  if (job.kind === "panel") return renderSpecToSvgCore(job.spec, job.data, job.size);
  // Loaded on first use: a worker that only renders panels never loads pdfkit, resvg or sharp.
  if (job.kind === "pdf") return (await import("./pdf-core.mjs")).svgToPdfCore(job.svg, job.options);
  if (job.kind === "raster") return (await import("./png-core.mjs")).printRasterCore(job.svg, job.options);
  if (job.kind === "figure") {
    const columns = job.layout?.columns ?? 1;
    const cells = gridPlacement(job.panels, columns);
    const extra = job.panels.map(() => ({ left: 0, top: 0, bottom: 0 }));
    const renderPanel = async (i) => {
      const p = job.panels[i];
      const widthMm = cellWidthMm(job.widthMm, columns, p.span ?? 1, job.layout?.gapMm);
      const r = await renderSpecToSvgCore(p.spec, p.data, { widthMm, heightMm: p.heightMm }, extra[i]);
      return { letter: p.letter, span: p.span, svg: r.svg, widthPx: r.widthPx, heightPx: r.heightPx, warnings: r.warnings, plot: r.plot };
    };
    const rendered = [];
    for (let i = 0; i < job.panels.length; i++) rendered.push(await renderPanel(i));
    // Line the axes up: grow the margins that are short, re-render those panels (tick labels can
    // change with the plot's size, hence a few passes).
    for (let pass = 0; job.layout?.alignAxes !== false && pass < 3; pass++) {
      const shift = alignmentPadding(
        rendered.map((r) => ({ plot: r.plot, height: r.heightPx })),
        cells,
      );
      if (isAligned(shift)) break;
      for (let i = 0; i < rendered.length; i++) {
        if (isAligned([shift[i]])) continue;
        for (const k of ["left", "top", "bottom"]) extra[i][k] += shift[i][k];
        rendered[i] = await renderPanel(i);
      }
    }
    const figure = composeFigureCore(rendered, job.layout, job.widthMm);
    return { ...figure, warnings: rendered.flatMap((r) => r.warnings.map((w) => `${r.letter}: ${w}`)) };
  }
  throw Object.assign(new Error(`unknown job kind ${job.kind}`), { code: "worker-failed" });
}

if (typeof process.send !== "function") {
  console.error("render-worker.mjs runs as a forked child process with an IPC channel");
  process.exit(2);
}
process.on("message", async (job) => {
  const t0 = performance.now();
  try {
    const result = await run(job);
    process.send({ id: job.id, ok: true, result, workMs: performance.now() - t0 });
  } catch (err) {
    process.send({ id: job.id, ok: false, error: { code: err?.code ?? "render-failed", message: err?.message ?? String(err) } });
  }
});
process.on("disconnect", () => process.exit(0));
process.send({ type: "ready" });
