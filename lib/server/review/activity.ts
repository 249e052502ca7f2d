import "server-only";
import { inArray } from "drizzle-orm";
import { getDb } from "@/db/client";
import { users } from "@/db/schema";
import { authorize, type SessionUser } from "@/lib/authz";
import { listAuditForManuscript } from "../audit";

const WORDS: Record<string, (d: Record<string, any>) => string> = {
  "manuscript.create": (d) => `created the manuscript “${d.title}”`,
  "member.invite": (d) => `invited ${d.email} as ${d.role}`,
  "member.join": (d) => `joined as ${d.role}`,
  "member.role": (d) => `changed a member's role from ${d.from} to ${d.to}`,
  "member.remove": () => "removed a member",
  "dataset.upload": (d) => `uploaded ${d.fileName} (version ${d.number}, sha256 ${String(d.sha256).slice(0, 12)}…)`,
  "dataset.metadata": (d) => `edited dataset details (${Object.keys(d).join(", ")})`,
  "analysis.run": (d) => `ran the ${d.model} fit (model version ${d.modelVersion})`,
  "analysis.import": (d) => `imported the ${d.model} fit from bundle ${String(d.bundleSha256).slice(0, 12)}…`,
  "bundle.import": (d) =>
    `imported a figure from bundle ${String(d.bundleSha256).slice(0, 12)}… (${d.datasets} datasets, ${d.analyses} fits, ${d.panels} panels; its review history not carried over)`,
  "figure.create": (d) => `created the figure “${d.title}”`,
  "figure.update": () => "changed a figure's layout or settings",
  "figure.reorder": () => "reordered panels",
  "panel.create": () => "added a panel",
  "panel.revise": (d) => `saved revision ${d.number}${d.message ? ` — “${d.message}”` : ""}`,
  "comment.create": () => "commented",
  "comment.edit": () => "edited a comment",
  "comment.delete": () => "deleted a comment",
  "thread.resolve": () => "resolved a thread",
  "thread.reopen": () => "reopened a thread",
  "review.approved": (d) => `approved a panel (hash ${String(d.contentHash).slice(0, 12)}…)`,
  "review.needs_revision": (d) => `asked for a revision${d.note ? `: “${d.note}”` : ""}`,
  "figure.signoff": (d) => `signed off a figure (hash ${String(d.figureHash).slice(0, 12)}…)${d.reason ? ` — reason: “${d.reason}”` : ""}`,
  "figure.signoff_withdraw": (d) => `withdrew a sign-off (hash ${String(d.figureHash).slice(0, 12)}…) — reason: “${d.reason}”`,
  "panel.send_to_review": (d) => `sent a panel to review (revision ${d.number})`,
  "archive.archive": (d) => `archived ${d.what}`,
  "archive.restore": (d) => `restored ${d.what}`,
  "archive.delete": (d) => `deleted ${d.what} for good`,
  "figure.export": (d) => `exported ${d.format}`,
  "manuscript.house_style": (d) => `changed the house style to ${d.after}`,
};

/** The manuscript's audit log in words, newest first. */
export async function manuscriptActivity(user: SessionUser, manuscriptId: string, limit = 200) {
  await authorize(user, "manuscript.read", manuscriptId);
  const rows = await listAuditForManuscript(getDb(), manuscriptId, limit);
  const ids = [...new Set(rows.map((r) => r.actorId).filter((x): x is string => Boolean(x)))];
  const names = new Map(
    (ids.length ? await getDb().select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, ids)) : []).map((u) => [u.id, u.name]),
  );
  return rows.map((r) => {
    const data = JSON.parse(r.data) as Record<string, unknown>;
    return {
      seq: r.seq,
      at: r.at,
      actor: names.get(r.actorId ?? "") ?? "someone",
      action: r.action,
      target: r.target,
      text: (WORDS[r.action] ?? (() => r.action))(data),
      hash: r.hash,
    };
  });
}
