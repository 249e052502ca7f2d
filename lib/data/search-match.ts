/**
 * Typed-search matching for pickers: every word of the query must occur (case and accents ignored)
 * somewhere in the item's searchable text.
 */
const fold = (s: string) =>
  s
    .normalize("NFKD")
    .replace(/[\u0300-\u036f]/g, "")
    .toLowerCase();

/** True when each whitespace-separated word of `query` occurs in one of `texts`; an empty query matches all. */
export function matchesQuery(query: string, texts: Array<string | null | undefined>): boolean {
  const words = fold(query).split(/\s+/).filter(Boolean);
  if (!words.length) return true;
  const hay = fold(texts.filter(Boolean).join(" \u0000 "));
  return words.every((w) => hay.includes(w));
}
