// Fit one model over several versions on all cores, storing each run; progress streams back as
// NDJSON (one event per line). Closing the connection stops the batch: no further fit starts.
import { withPermission } from "@/lib/http/route";
import { ndjsonResponse } from "@/lib/http/ndjson";
import { runBatch } from "@/lib/server/analyses/batch";
import { batchInput } from "@/lib/server/analyses/schemas";

export const POST = withPermission("analysis.run", { body: batchInput, scope: ({ body }) => body.manuscriptId }, async ({ req, user, body }) => {
  const stop = new AbortController();
  req.signal.addEventListener("abort", () => stop.abort());
  return ndjsonResponse(runBatch(user, body, stop.signal), stop);
});
