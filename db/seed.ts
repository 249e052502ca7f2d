import { eq } from "drizzle-orm";
import { getDb } from "./client";
import { labMembers, labs, manuscriptMembers, manuscripts, users, type Role } from "./schema";
import { hashPassword } from "@/lib/server/users";

export const DEMO_PASSWORD = "prooflight-demo";
export const DEMO_MANUSCRIPT_ID = "demo-manuscript";
export const DEMO_LAB_ID = "demo-lab";
export const OTHER_LAB_ID = "demo-other-lab";
export const OTHER_MANUSCRIPT_ID = "demo-other-manuscript";

// Invented people, labs and samples.
export const DEMO_ACCOUNTS: Array<{ id: string; email: string; name: string; role: Role | null; lab: string }> = [
  { id: "demo-pi", email: "pi@lab.example.org", name: "Mira Halvorsen", role: "pi", lab: DEMO_LAB_ID },
  { id: "demo-author", email: "author@lab.example.org", name: "Tomás Ekberg", role: "author", lab: DEMO_LAB_ID },
  { id: "demo-reviewer", email: "reviewer@partner.example.org", name: "Ines Varga", role: "reviewer", lab: "" },
  { id: "demo-viewer", email: "viewer@lab.example.org", name: "Luca Brenner", role: "viewer", lab: DEMO_LAB_ID },
  { id: "demo-outsider", email: "outsider@elsewhere.example.org", name: "Noor Castell", role: null, lab: OTHER_LAB_ID },
];

/** Idempotent: a rerun keeps every existing row and only adds what is missing. */
export async function seedDemo(): Promise<void> {
  const db = getDb();
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  await db.transaction(async (tx) => {
    await tx.insert(labs).values([
      { id: DEMO_LAB_ID, name: "Kestrel Spin Sensing Group" },
      { id: OTHER_LAB_ID, name: "Alder Surface Physics Lab" },
    ]).onConflictDoNothing();
    for (const a of DEMO_ACCOUNTS) {
      const [existing] = await tx.select({ id: users.id }).from(users).where(eq(users.email, a.email));
      const userId = existing?.id ?? a.id;
      if (!existing) await tx.insert(users).values({ id: userId, email: a.email, name: a.name, passwordHash });
      if (a.lab) await tx.insert(labMembers).values({ labId: a.lab, userId, role: a.role === "pi" ? "head" : "member" }).onConflictDoNothing();
    }
    await tx.insert(manuscripts).values([
      { id: DEMO_MANUSCRIPT_ID, labId: DEMO_LAB_ID, title: "Coherence and proton NMR of shallow NV centres in Kestrel-grown diamond", createdBy: "demo-pi" },
      { id: OTHER_MANUSCRIPT_ID, labId: OTHER_LAB_ID, title: "Charge-state stability under oxygen termination", createdBy: "demo-outsider" },
    ]).onConflictDoNothing();
    for (const a of DEMO_ACCOUNTS) {
      if (a.role) await tx.insert(manuscriptMembers).values({ manuscriptId: DEMO_MANUSCRIPT_ID, userId: a.id, role: a.role }).onConflictDoNothing();
    }
    await tx.insert(manuscriptMembers).values({ manuscriptId: OTHER_MANUSCRIPT_ID, userId: "demo-outsider", role: "pi" }).onConflictDoNothing();
  });
}
