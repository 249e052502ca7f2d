/**
 * A streamed answer of JSON lines from an async generator. The generator's first event is awaited
 * before the response starts, so the checks it makes (authorization, input) throw into the route
 * wrapper and become the usual 4xx answer. Cancelling the stream (the client went away) aborts `stop`.
 */
export async function ndjsonResponse(events: AsyncGenerator<unknown>, stop: AbortController): Promise<Response> {
  const first = await events.next();
  const encoder = new TextEncoder();
  const line = (event: unknown) => encoder.encode(`${JSON.stringify(event)}\n`);
  const stream = new ReadableStream<Uint8Array>({
    start(controller) {
      if (first.done) controller.close();
      else controller.enqueue(line(first.value));
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
}
