import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { datasets, versions } from "@/db/schema";
import { notFound } from "@/lib/errors";
import { onceInRequest } from "../request-memo";

/** Which manuscript a dataset belongs to; unknown ids are 404 before any permission is checked. */
export function manuscriptOfDataset(datasetId: string): Promise<string> {
  return onceInRequest(`manuscriptOfDataset:${datasetId}`, async () => {
    const [d] = await getDb().select({ m: datasets.manuscriptId }).from(datasets).where(eq(datasets.id, datasetId));
    if (!d) throw notFound();
    return d.m;
  });
}

export function manuscriptOfVersion(versionId: string): Promise<string> {
  return onceInRequest(`manuscriptOfVersion:${versionId}`, async () => {
    const [v] = await getDb()
      .select({ m: datasets.manuscriptId })
      .from(versions)
      .innerJoin(datasets, eq(datasets.id, versions.datasetId))
      .where(eq(versions.id, versionId));
    if (!v) throw notFound();
    return v.m;
  });
}
