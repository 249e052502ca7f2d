/** A line diff by longest common subsequence, for showing two pretty-printed specs side by side. */

export type DiffLine = { kind: "same" | "added" | "removed"; text: string; oldNo?: number; newNo?: number };

/** Above this many cells (after trimming the common ends) the middle is shown as removed + added. */
const MAX_CELLS = 4_000_000;

export function lineDiff(oldText: string, newText: string): DiffLine[] {
  const a = oldText.split("\n");
  const b = newText.split("\n");
  let start = 0;
  while (start < a.length && start < b.length && a[start] === b[start]) start++;
  let endA = a.length,
    endB = b.length;
  while (endA > start && endB > start && a[endA - 1] === b[endB - 1]) {
    endA--;
    endB--;
  }

  const out: DiffLine[] = [];
  for (let i = 0; i < start; i++) out.push({ kind: "same", text: a[i], oldNo: i + 1, newNo: i + 1 });
  out.push(...middle(a.slice(start, endA), b.slice(start, endB), start));
  for (let i = endA, j = endB; i < a.length; i++, j++) out.push({ kind: "same", text: a[i], oldNo: i + 1, newNo: j + 1 });
  return out;
}

function middle(a: string[], b: string[], offset: number): DiffLine[] {
  const n = a.length,
    m = b.length;
  if ((n + 1) * (m + 1) > MAX_CELLS) {
    return [
      ...a.map((text, i) => ({ kind: "removed" as const, text, oldNo: offset + i + 1 })),
      ...b.map((text, j) => ({ kind: "added" as const, text, newNo: offset + j + 1 })),
    ];
  }
  // lcs[i][j] = length of the LCS of a[i..] and b[j..]
  const w = m + 1;
  const lcs = new Uint32Array((n + 1) * w);
  for (let i = n - 1; i >= 0; i--) {
    for (let j = m - 1; j >= 0; j--) {
      lcs[i * w + j] = a[i] === b[j] ? lcs[(i + 1) * w + j + 1] + 1 : Math.max(lcs[(i + 1) * w + j], lcs[i * w + j + 1]);
    }
  }
  const out: DiffLine[] = [];
  let i = 0,
    j = 0;
  while (i < n || j < m) {
    if (i < n && j < m && a[i] === b[j]) {
      out.push({ kind: "same", text: a[i], oldNo: offset + i + 1, newNo: offset + j + 1 });
      i++;
      j++;
    } else if (i < n && (j === m || lcs[(i + 1) * w + j] >= lcs[i * w + j + 1])) {
      out.push({ kind: "removed", text: a[i], oldNo: offset + i + 1 });
      i++;
    } else {
      out.push({ kind: "added", text: b[j], newNo: offset + j + 1 });
      j++;
    }
  }
  return out;
}
