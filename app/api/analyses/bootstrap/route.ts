// A fit with bootstrap intervals, nothing stored; progress streams back as NDJSON (one event per
// line) and closing the connection stops the draws.
import { withPermission } from "@/lib/http/route";
import { ndjsonResponse } from "@/lib/http/ndjson";
import { manuscriptOfVersion } from "@/lib/server/datasets/scope";
import { previewWithBootstrap } from "@/lib/server/analyses/bootstrap-preview";
import { analysisInput } from "@/lib/server/analyses/schemas";

export const POST = withPermission(
  "analysis.run",
  { body: analysisInput, scope: ({ body }) => manuscriptOfVersion(body.versionId) },
  async ({ req, user, body }) => {
    const stop = new AbortController();
    req.signal.addEventListener("abort", () => stop.abort());
    return ndjsonResponse(previewWithBootstrap(user, body, stop.signal), stop);
  },
);
