/** Text helpers of the metadata form: tags as `key=value` lists and file names without extension (numbers, counts, sizes and hashes: @/lib/data/format). */

export function formatTags(tags: Record<string, string> | null | undefined): string {
  return Object.entries(tags ?? {})
    .map(([k, v]) => `${k}=${v}`)
    .join(", ");
}

/** `key=value, key=value` → object; a piece without `=` is an error the user sees before anything is sent. */
export function parseTags(text: string): { tags: Record<string, string>; error?: string } {
  const tags: Record<string, string> = {};
  for (const piece of text
    .split(",")
    .map((p) => p.trim())
    .filter(Boolean)) {
    const eq = piece.indexOf("=");
    if (eq <= 0) return { tags, error: `“${piece}” is not key=value.` };
    tags[piece.slice(0, eq).trim()] = piece.slice(eq + 1).trim();
  }
  return { tags };
}

export function fileStem(fileName: string): string {
  const dot = fileName.lastIndexOf(".");
  return dot > 0 ? fileName.slice(0, dot) : fileName;
}
