import "server-only";
import { eq } from "drizzle-orm";
import { getDb } from "@/db/client";
import { datasets, versions } from "@/db/schema";
import { manuscriptOnceInRequest } from "../request-memo";

/** Which manuscript a dataset belongs to; unknown ids are 404 before any permission is checked. */
export function manuscriptOfDataset(datasetId: string): Promise<string> {
  return manuscriptOnceInRequest("dataset", datasetId, () => getDb().select({ m: datasets.manuscriptId }).from(datasets).where(eq(datasets.id, datasetId)));
}

export function manuscriptOfVersion(versionId: string): Promise<string> {
  return manuscriptOnceInRequest("version", versionId, () =>
    getDb().select({ m: datasets.manuscriptId }).from(versions).innerJoin(datasets, eq(datasets.id, versions.datasetId)).where(eq(versions.id, versionId)),
  );
}
