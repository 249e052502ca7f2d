// A local S3-compatible server (s3rver) on a free loopback port with one empty bucket, for the tests
// that run the S3 store and for the two-instance test. Its files live in a temporary folder.
import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import S3rver from "s3rver";

export interface FakeS3 {
  /** The environment that points the app at this server (STORAGE=s3 and the S3_* settings). */
  env: Record<string, string>;
  /** Every object written or removed, in order (s3rver's event notifications). */
  writes: Array<{ event: string; key: string }>;
  close(): Promise<void>;
}

export async function startFakeS3(bucket = "prooflight-test"): Promise<FakeS3> {
  const directory = fs.mkdtempSync(path.join(os.tmpdir(), "prooflight-s3-"));
  const server = new S3rver({ address: "127.0.0.1", port: 0, silent: true, directory, configureBuckets: [{ name: bucket }] });
  const writes: FakeS3["writes"] = [];
  server.on("event", (e) => {
    for (const r of e.Records) writes.push({ event: r.eventName, key: decodeURIComponent(r.s3.object.key) });
  });
  const { port } = await server.run();
  return {
    env: {
      STORAGE: "s3",
      S3_ENDPOINT: `http://127.0.0.1:${port}`,
      S3_REGION: "us-east-1",
      S3_BUCKET: bucket,
      // s3rver checks request signatures against these fixed keys.
      S3_ACCESS_KEY_ID: "S3RVER",
      S3_SECRET_ACCESS_KEY: "S3RVER",
      S3_FORCE_PATH_STYLE: "true",
    },
    writes,
    async close() {
      await server.close();
      fs.rmSync(directory, { recursive: true, force: true });
    },
  };
}
