/**
 * The way back from the fit page to the panel builder that sent the user there. Only a panel page of
 * this site is accepted (a path, never another origin), so the link cannot lead elsewhere.
 */
const PANEL_PATH = /^\/panels\/[A-Za-z0-9_-]{1,128}(\?[^#\s\\]*)?$/;

/** The return path when it is a panel page of this site, else null. */
export function safeReturnTo(raw: string | null | undefined): string | null {
  if (typeof raw !== "string" || raw.length > 1000) return null;
  return PANEL_PATH.test(raw) ? raw : null;
}

/** The return path with `bind=<analysisId>` set, so the builder chooses the run just stored. */
export function returnWithRun(returnTo: string, analysisId: string): string {
  const [path, query = ""] = returnTo.split("?", 2);
  const params = new URLSearchParams(query);
  params.set("bind", analysisId);
  return `${path}?${params.toString()}`;
}
