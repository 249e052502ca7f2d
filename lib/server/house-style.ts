import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { manuscripts } from "@/db/schema";
import { authorize, type SessionUser } from "@/lib/authz";
import { notFound } from "@/lib/errors";
import { DEFAULT_HOUSE_STYLE, describeHouseStyle, houseStyleSchema, readHouseStyle, type HouseStyle } from "@/lib/figures/house-style";
import { appendAudit } from "./audit";

/** The manuscript's house style (the defaults when none is set); no permission check (callers have made it). */
export async function houseStyleOf(manuscriptId: string): Promise<HouseStyle> {
  const [row] = await getDb().select({ houseStyle: manuscripts.houseStyle }).from(manuscripts).where(eq(manuscripts.id, manuscriptId));
  if (!row) throw notFound();
  return readHouseStyle(row.houseStyle);
}

export interface HouseStyleView {
  style: HouseStyle;
  defaults: HouseStyle;
  summary: string;
}

export async function getHouseStyle(user: SessionUser, manuscriptId: string): Promise<HouseStyleView> {
  await authorize(user, "manuscript.read", manuscriptId);
  const style = await houseStyleOf(manuscriptId);
  return { style, defaults: DEFAULT_HOUSE_STYLE, summary: describeHouseStyle(style) };
}

/** Replaces the house style (every field, checked); recorded in the audit log with the old and new summary. */
export async function setHouseStyle(user: SessionUser, manuscriptId: string, raw: unknown): Promise<HouseStyleView> {
  await authorize(user, "figure.edit", manuscriptId);
  const style = houseStyleSchema.parse(raw);
  const before = await houseStyleOf(manuscriptId);
  await getDb().transaction(async (tx) => {
    await tx.update(manuscripts).set({ houseStyle: style }).where(eq(manuscripts.id, manuscriptId));
    await appendAudit(tx, {
      actorId: user.id,
      manuscriptId,
      action: "manuscript.house_style",
      target: `manuscript:${manuscriptId}`,
      data: { before: describeHouseStyle(before), after: describeHouseStyle(style), style },
    });
  });
  return { style, defaults: DEFAULT_HOUSE_STYLE, summary: describeHouseStyle(style) };
}
