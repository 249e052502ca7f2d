/** Display helpers for measured numbers, file sizes, hashes and tags. */

/** Up to `digits` significant digits; exponent form outside 1e-3 … 1e6 so ticks and summaries stay short. */
export function formatNumber(v: number | null | undefined, digits = 5): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return "—";
  if (v === 0) return "0";
  const a = Math.abs(v);
  if (a >= 1e6 || a < 1e-3) {
    const [mantissa, exponent] = v.toExponential(digits - 1).split("e");
    return `${trimZeros(mantissa!)}e${Number(exponent)}`;
  }
  return String(Number(v.toPrecision(digits)));
}

function trimZeros(s: string): string {
  return s.includes(".") ? s.replace(/\.?0+$/, "") : s;
}

export function formatCount(n: number): string {
  return n.toLocaleString("en-US");
}

export function formatBytes(n: number): string {
  if (n < 1024) return `${n} B`;
  const units = ["kB", "MB", "GB"];
  let v = n / 1024;
  let i = 0;
  while (v >= 1024 && i < units.length - 1) { v /= 1024; i++; }
  return `${v < 10 ? v.toFixed(1) : Math.round(v)} ${units[i]}`;
}

export function shortHash(sha256: string): string {
  return `${sha256.slice(0, 8)}…`;
}

export function formatTags(tags: Record<string, string> | null | undefined): string {
  return Object.entries(tags ?? {}).map(([k, v]) => `${k}=${v}`).join(", ");
}

/** `key=value, key=value` → object; a piece without `=` is an error the user sees before anything is sent. */
export function parseTags(text: string): { tags: Record<string, string>; error?: string } {
  const tags: Record<string, string> = {};
  for (const piece of text.split(",").map((p) => p.trim()).filter(Boolean)) {
    const eq = piece.indexOf("=");
    if (eq <= 0) return { tags, error: `“${piece}” is not key=value.` };
    tags[piece.slice(0, eq).trim()] = piece.slice(eq + 1).trim();
  }
  return { tags };
}

export function axisTitle(name: string, unit: string | null | undefined): string {
  return unit ? `${name} (${unit})` : name;
}

export function fileStem(fileName: string): string {
  const dot = fileName.lastIndexOf(".");
  return dot > 0 ? fileName.slice(0, dot) : fileName;
}
