// Fit one model over several versions on all cores, storing each run; progress streams back as
// NDJSON (one event per line). Closing the connection stops the batch: no further fit starts.
import { withPermission } from "@/lib/http/route";
import { runBatch } from "@/lib/server/analyses/batch";
import { batchInput } from "@/lib/server/analyses/schemas";

export const POST = withPermission("analysis.run", { body: batchInput, scope: ({ body }) => body.manuscriptId }, async ({ req, user, body }) => {
  const stop = new AbortController();
  req.signal.addEventListener("abort", () => stop.abort());
  const events = runBatch(user, body, stop.signal);
  // The checks (version scope, duplicates) run before the first event: their errors are the response.
  const first = await events.next();
  const encoder = new TextEncoder();
  const line = (event: unknown) => encoder.encode(`${JSON.stringify(event)}\n`);
  const stream = new ReadableStream<Uint8Array>({
    start(controller) {
      if (!first.done) controller.enqueue(line(first.value));
    },
    async pull(controller) {
      const next = await events.next();
      if (next.done) controller.close();
      else controller.enqueue(line(next.value));
    },
    cancel() {
      stop.abort();
    },
  });
  return new Response(stream, { status: 200, headers: { "content-type": "application/x-ndjson; charset=utf-8", "cache-control": "no-store" } });
});
