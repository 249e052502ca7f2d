import { count, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { datasets } from "@/db/schema";
import { demoFiles } from "@/db/demo-data";
import { DEMO_ACCOUNTS, DEMO_MANUSCRIPT_ID, seedDemo } from "@/db/seed";
import { importDatasetFromBytes } from "../datasets/upload-dataset";

/**
 * The demo lab, its people and manuscript, then the invented measurement files uploaded by the
 * demo author through the ordinary ingest path. Idempotent: files are only added to an empty manuscript.
 */
export async function seedDemoWithData(): Promise<{ filesAdded: number }> {
  await seedDemo();
  const [{ n } = { n: 0 }] = await getDb().select({ n: count() }).from(datasets).where(eq(datasets.manuscriptId, DEMO_MANUSCRIPT_ID));
  if (n > 0) return { filesAdded: 0 };
  const author = DEMO_ACCOUNTS.find((a) => a.role === "author")!;
  const user = { id: author.id, email: author.email, name: author.name };
  const files = demoFiles();
  for (const f of files) {
    await importDatasetFromBytes(user, DEMO_MANUSCRIPT_ID, f.fileName, new TextEncoder().encode(f.content), {
      name: f.name,
      metadata: JSON.stringify({ kind: f.kind, sample: f.sample, instrument: f.instrument, measuredAt: f.measuredAt, notes: f.notes, tags: f.tags }),
    });
  }
  return { filesAdded: files.length };
}
