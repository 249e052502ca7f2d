/**
 * The Content-Security-Policy of every page: scripts only with this response's nonce (and what
 * they load, 'strict-dynamic'), no eval (Vega runs expressions through its interpreter), no
 * plugins, no framing, forms and connections to our own origin only. Inline style attributes are
 * allowed: React and Vega set them, and styles cannot run script.
 */
export function pageContentSecurityPolicy(nonce: string, opts: { development: boolean; https: boolean }): string {
  const directives = [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${opts.development ? " 'unsafe-eval'" : ""}`,
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' blob: data:",
    "font-src 'self'",
    `connect-src 'self'${opts.development ? " ws: wss:" : ""}`,
    "worker-src 'self' blob:",
    "object-src 'none'",
    "base-uri 'none'",
    "form-action 'self'",
    "frame-ancestors 'none'",
    ...(opts.https ? ["upgrade-insecure-requests"] : []),
  ];
  return directives.join("; ");
}

/** For API answers and downloads: nothing in them may run, load or be framed, even if opened as a page. */
export const DOWNLOAD_CONTENT_SECURITY_POLICY = "default-src 'none'; frame-ancestors 'none'; sandbox";
