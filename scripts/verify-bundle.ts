// npm run verify -- <bundle.zip>: checks a reproducibility bundle from its own contents and prints the table.
// Exit code 0 only when every check matches; 1 when one does not; 2 when the bundle cannot be read.
import fs from "node:fs";

const file = process.argv[2];
if (!file) {
  console.error("Usage: npm run verify -- <bundle.zip>");
  process.exit(2);
}
const { verifyBundle, formatVerifyReport } = await import("@/lib/server/export/verify-bundle");
const { stopRenderWorkers } = await import("@/lib/server/render/render-in-worker");
let bytes: Uint8Array;
try {
  bytes = new Uint8Array(fs.readFileSync(file));
} catch (err) {
  console.error(`Cannot read ${file}: ${(err as Error).message}`);
  process.exit(2);
}
const report = await verifyBundle(bytes).catch((err: Error) => {
  console.error(`${file}: ${err.message}`);
  process.exit(2);
});
await stopRenderWorkers();
console.log(formatVerifyReport(report));
process.exit(report.ok ? 0 : 1);
