import "server-only";
import { eq, sql } from "drizzle-orm";
import { preparedQuery } from "@/db/prepared";
import { datasets, versions } from "@/db/schema";
import { manuscriptOnceInRequest } from "@/lib/request-memo";

const id = sql.placeholder("id");
const ofDataset = preparedQuery((db) => db.select({ m: datasets.manuscriptId }).from(datasets).where(eq(datasets.id, id)).prepare());
const ofVersion = preparedQuery((db) =>
  db.select({ m: datasets.manuscriptId }).from(versions).innerJoin(datasets, eq(datasets.id, versions.datasetId)).where(eq(versions.id, id)).prepare(),
);

/** Which manuscript a dataset belongs to; unknown ids are 404 before any permission is checked. */
export function manuscriptOfDataset(datasetId: string): Promise<string> {
  return manuscriptOnceInRequest("dataset", datasetId, () => ofDataset().all({ id: datasetId }));
}

export function manuscriptOfVersion(versionId: string): Promise<string> {
  return manuscriptOnceInRequest("version", versionId, () => ofVersion().all({ id: versionId }));
}
