/**
 * Parse benchmark: our parser vs PapaParse and uDSV on the same bytes (best of 3 each).
 * Every contender starts from the bytes, so UTF-8 decoding is inside each timing;
 * `papaparse_bare_ms` also gives PapaParse on the pre-decoded string alone.
 */
import Papa from "papaparse";
import { inferSchema, initParser } from "udsv";
import { parseTable } from "@/lib/data/parse";
import { mulberry32 } from "@/lib/demo-data/prng";

/**
 * A numeric CSV like an echo or ODMR export: `t_us` rising in 1 ns steps, then noisy signal
 * columns. 1,000,000 × 3 comes to about 24 MB.
 */
export function makeNumericCsv(rows: number, cols: number, seed = 1): Uint8Array {
  const rnd = mulberry32(seed);
  const header = ["t_us", ...Array.from({ length: cols - 1 }, (_, j) => `signal_${j + 1}`)].join(",");
  const chunks: string[] = [header];
  const CHUNK = 10_000;
  let lines: string[] = [];
  for (let i = 0; i < rows; i++) {
    const cells = [(i * 0.001).toFixed(3)];
    for (let j = 1; j < cols; j++) cells.push((rnd() * 1000).toFixed(3));
    lines.push(cells.join(","));
    if (lines.length === CHUNK) {
      chunks.push(lines.join("\n"));
      lines = [];
    }
  }
  if (lines.length > 0) chunks.push(lines.join("\n"));
  return new TextEncoder().encode(`${chunks.join("\n")}\n`);
}

function bestOf3(run: () => unknown): number {
  let best = Infinity;
  for (let k = 0; k < 3; k++) {
    (globalThis as { gc?: () => void }).gc?.();
    const t0 = performance.now();
    run();
    best = Math.min(best, performance.now() - t0);
  }
  return best;
}

export async function benchParse(bytes: Uint8Array): Promise<Record<string, number>> {
  const mb = bytes.length / 1e6;
  const decode = () => new TextDecoder("utf-8").decode(bytes);
  const text = decode();
  const ours = bestOf3(() => parseTable(bytes, { fileName: "bench.csv" }));
  const papa = bestOf3(() => Papa.parse(decode(), { dynamicTyping: true }));
  const papaBare = bestOf3(() => Papa.parse(text, { dynamicTyping: true }));
  const udsv = bestOf3(() => {
    const s = decode();
    initParser(inferSchema(s)).typedCols(s);
  });
  return {
    megabytes: mb,
    prooflight_ms: ours,
    prooflight_MBps: mb / (ours / 1000),
    papaparse_ms: papa,
    papaparse_MBps: mb / (papa / 1000),
    papaparse_bare_ms: papaBare,
    papaparse_bare_MBps: mb / (papaBare / 1000),
    udsv_ms: udsv,
    udsv_MBps: mb / (udsv / 1000),
  };
}
