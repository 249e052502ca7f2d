// `npm run storage:copy`: copies every stored file from the uploads folder (UPLOADS_DIR) into the
// S3-compatible bucket that STORAGE=s3 and the S3_* settings name, re-hashing each on the way.
// Run it once before starting the instances with STORAGE=s3; running it again copies only what is missing.
import { ensureLocalEnv } from "./lib/local-env";
ensureLocalEnv();

const { env } = await import("@/lib/env");
const { LocalBlobStore } = await import("@/lib/server/storage/local-store");
const { blobStore } = await import("@/lib/server/storage/store");
const { copyBlobs } = await import("@/lib/server/storage/copy-blobs");

const target = blobStore();
if (target.kind !== "s3") {
  console.error("Set STORAGE=s3 and the S3_* settings first: the files are copied from UPLOADS_DIR into that bucket.");
  process.exit(2);
}
const source = new LocalBlobStore(env().uploadsDir);
const report = await copyBlobs(source, target);
console.log(`${report.copied} files copied into the bucket, ${report.present} already there, ${report.failed.length} refused.`);
for (const f of report.failed) console.error(`  ${f.sha256}: ${f.reason}`);
process.exitCode = report.failed.length ? 1 : 0;
