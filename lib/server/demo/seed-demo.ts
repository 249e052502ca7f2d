import "server-only";
import { count, eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { datasets, labMembers, labs, manuscriptMembers, manuscripts, users } from "@/db/schema";
import { demoFiles } from "@/lib/demo-data";
import { DEMO_ACCOUNTS, DEMO_LAB_ID, DEMO_MANUSCRIPT_ID, DEMO_PASSWORD, OTHER_LAB_ID, OTHER_MANUSCRIPT_ID } from "@/lib/demo-data/accounts";
import { importDatasetFromBytes } from "../datasets/upload-dataset";
import { hashPassword } from "../users";
import { seedDemoStory } from "./demo-story";

/** The demo lab, its people and manuscripts. Idempotent: a rerun keeps every existing row and only adds what is missing. */
export async function seedDemo(): Promise<void> {
  const db = getDb();
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  await db.transaction(async (tx) => {
    await tx
      .insert(labs)
      .values([
        { id: DEMO_LAB_ID, name: "Kestrel Spin Sensing Group" },
        { id: OTHER_LAB_ID, name: "Alder Surface Physics Lab" },
      ])
      .onConflictDoNothing();
    for (const a of DEMO_ACCOUNTS) {
      const [existing] = await tx.select({ id: users.id }).from(users).where(eq(users.email, a.email));
      const userId = existing?.id ?? a.id;
      if (!existing) await tx.insert(users).values({ id: userId, email: a.email, name: a.name, passwordHash });
      if (a.lab)
        await tx
          .insert(labMembers)
          .values({ labId: a.lab, userId, role: a.role === "pi" ? "head" : "member" })
          .onConflictDoNothing();
    }
    await tx
      .insert(manuscripts)
      .values([
        { id: DEMO_MANUSCRIPT_ID, labId: DEMO_LAB_ID, title: "Coherence and proton NMR of shallow NV centres in Kestrel-grown diamond", createdBy: "demo-pi" },
        { id: OTHER_MANUSCRIPT_ID, labId: OTHER_LAB_ID, title: "Charge-state stability under oxygen termination", createdBy: "demo-outsider" },
      ])
      .onConflictDoNothing();
    for (const a of DEMO_ACCOUNTS) {
      if (a.role) await tx.insert(manuscriptMembers).values({ manuscriptId: DEMO_MANUSCRIPT_ID, userId: a.id, role: a.role }).onConflictDoNothing();
    }
    await tx.insert(manuscriptMembers).values({ manuscriptId: OTHER_MANUSCRIPT_ID, userId: "demo-outsider", role: "pi" }).onConflictDoNothing();
  });
}

/**
 * The demo lab, its people and manuscript, then the invented measurement files uploaded by the
 * demo author through the ordinary ingest path, then the manuscript's review story (demo-story.ts).
 * Idempotent: files are only added to an empty manuscript, the story only to one without figures.
 * The API tests seed with `seedDemo` alone, which stays fast.
 */
export async function seedDemoWithData(): Promise<{ filesAdded: number; storyTold: boolean }> {
  await seedDemo();
  const [{ n } = { n: 0 }] = await getDb().select({ n: count() }).from(datasets).where(eq(datasets.manuscriptId, DEMO_MANUSCRIPT_ID));
  const filesAdded = n > 0 ? 0 : await uploadDemoFiles();
  const { told } = await seedDemoStory();
  return { filesAdded, storyTold: told };
}

async function uploadDemoFiles(): Promise<number> {
  const author = DEMO_ACCOUNTS.find((a) => a.role === "author")!;
  const user = { id: author.id, email: author.email, name: author.name };
  const files = demoFiles();
  for (const f of files) {
    await importDatasetFromBytes(user, DEMO_MANUSCRIPT_ID, f.fileName, new TextEncoder().encode(f.content), {
      name: f.name,
      metadata: JSON.stringify({ kind: f.kind, sample: f.sample, instrument: f.instrument, measuredAt: f.measuredAt, notes: f.notes, tags: f.tags }),
    });
  }
  return files.length;
}
