/**
 * The browser's one way to call our JSON API: `fetchJson` for reads (TanStack Query's queryFn),
 * `sendJson` for writes. An error answer becomes an `ApiError` carrying the server's own message
 * (it names the field, or file, line and column) and its details.
 */

/** What JSON makes of a server type: dates arrive as strings (server components still pass Dates). */
export type Wire<T> = T extends Date ? Date | string : T extends Array<infer U> ? Array<Wire<U>> : T extends object ? { [K in keyof T]: Wire<T[K]> } : T;

/** An error answer of our API, carrying the server's own message and `error.details`. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
    this.name = "ApiError";
  }
}

interface ErrorBody {
  error?: { message?: string; details?: unknown };
}

function errorBody(text: string): ErrorBody["error"] {
  try {
    return (JSON.parse(text) as ErrorBody | null)?.error;
  } catch {
    return undefined; // not JSON
  }
}

/** The server's message from an error answer's body, else "The server answered <status>." */
export function messageFromBody(status: number, text: string): string {
  return errorBody(text)?.message || `The server answered ${status}.`;
}

export async function fetchJson<T>(url: string, init?: RequestInit): Promise<T> {
  const res = await fetch(url, {
    ...init,
    headers: { accept: "application/json", ...(init?.body ? { "content-type": "application/json" } : {}), ...init?.headers },
  });
  const text = await res.text();
  if (!res.ok) throw new ApiError(res.status, messageFromBody(res.status, text), errorBody(text)?.details);
  return JSON.parse(text) as T;
}

/** JSON to our API; errors carry the server's own message. */
export function sendJson<T>(url: string, method: "POST" | "PUT" | "PATCH" | "DELETE", body?: unknown): Promise<T> {
  return fetchJson<T>(url, { method, body: body === undefined ? undefined : JSON.stringify(body) });
}

/**
 * POSTs JSON to a route that answers NDJSON and hands each line's value to `onEvent` as it
 * arrives; aborting `signal` closes the connection (the server then stops). An error answer
 * (before the stream starts) throws an ApiError with the server's message.
 */
export async function postForEvents<E>(url: string, body: unknown, onEvent: (event: E) => void, signal?: AbortSignal): Promise<void> {
  const res = await fetch(url, {
    method: "POST",
    headers: { accept: "application/x-ndjson", "content-type": "application/json" },
    body: JSON.stringify(body),
    signal,
  });
  if (!res.ok || !res.body) {
    const text = await res.text();
    throw new ApiError(res.status, messageFromBody(res.status, text), errorBody(text)?.details);
  }
  const reader = res.body.pipeThrough(new TextDecoderStream()).getReader();
  let buffered = "";
  for (;;) {
    const { value, done } = await reader.read();
    if (done) break;
    buffered += value;
    for (let end = buffered.indexOf("\n"); end >= 0; end = buffered.indexOf("\n")) {
      const line = buffered.slice(0, end).trim();
      buffered = buffered.slice(end + 1);
      if (line) onEvent(JSON.parse(line) as E);
    }
  }
}
