/** The invented demo lab, its people and manuscripts: plain data shared by the seed, scripts and tests. */
import type { Role } from "@/db/schema";

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
