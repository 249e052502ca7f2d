import "server-only";
import type { versions } from "@/db/schema";

type VersionRow = typeof versions.$inferSelect;

/** The contract's version shape, plus what the dataset page shows. */
export function toVersionDto(v: VersionRow) {
  return {
    id: v.id,
    datasetId: v.datasetId,
    number: v.number,
    sha256: v.sha256,
    byteSize: v.byteSize,
    rowCount: v.rowCount,
    columns: v.columns,
    fileName: v.fileName,
    createdAt: v.createdAt,
    createdBy: v.createdBy,
    warnings: v.parseInfo.warnings,
    parse: {
      format: v.parseInfo.format,
      encoding: v.parseInfo.encoding,
      delimiter: v.parseInfo.delimiter,
      decimal: v.parseInfo.decimal,
      headerMetadata: v.parseInfo.headerMetadata,
    },
    summary: v.summary,
    derivedFromAnalysisId: v.derivedFromAnalysisId,
  };
}
export type VersionDto = ReturnType<typeof toVersionDto>;
