"use server";
import { z } from "zod";
import { withAction } from "@/lib/http/action";
import { runAnalysis } from "@/lib/server/analyses/run-analysis";
import { fitOptions } from "@/lib/server/analyses/schemas";
import { manuscriptOfVersion } from "@/lib/server/datasets/scope";

// Forms send the options as one JSON field; the same schema as POST /api/analyses validates it.
const formInput = z.object({
  versionId: z.string().min(1),
  model: z.string().min(1),
  options: z.string().transform((s, ctx) => {
    try { return fitOptions.parse(JSON.parse(s)); } catch (e) { ctx.addIssue({ code: "custom", message: `options: ${(e as Error).message}` }); return z.NEVER; }
  }),
});

export const runAnalysisAction = withAction("analysis.run", { input: formInput, scope: (i) => manuscriptOfVersion(i.versionId) }, async ({ user, input }) => {
  const run = await runAnalysis(user, input);
  return { ok: true, message: `Saved. χ²ᵣ = ${run.chi2red?.toPrecision(3) ?? "—"}`, data: { id: run.id, derivedVersionId: run.derivedVersionId } };
});
