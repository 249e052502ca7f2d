import type { RowTable } from "@/lib/data/table-rows";
import type { BundleBoundData, BundlePanelData } from "./bundle-layout";
import { utf8Blocks } from "./utf8-chunks";

type Described = Omit<BundleBoundData, "columns" | "values">;

function* pieces(head: Omit<BundlePanelData, "data">, data: Record<string, { described: Described; table: RowTable }>): Generator<string> {
  yield JSON.stringify(head).slice(0, -1) + ',"data":{';
  let k = 0;
  for (const [name, { described, table }] of Object.entries(data)) {
    // `columns` and `values` are the last keys of each entry: the description without its closing brace, then the columns.
    yield `${k++ ? "," : ""}${JSON.stringify(name)}:${JSON.stringify(described).slice(0, -1)}${Object.keys(described).length ? "," : ""}"columns":${JSON.stringify(table.names)},"values":[`;
    for (let j = 0; j < table.names.length; j++) {
      yield j ? ",[" : "[";
      for (let i = 0; i < table.length; i++) yield `${i ? "," : ""}${JSON.stringify(table.cell(i, j))}`;
      yield "]";
    }
    yield "]}";
  }
  yield "}}\n";
}

/**
 * A panel's data file of the bundle (data/panel-<letter>.json), byte for byte what JSON.stringify of
 * its BundlePanelData gives, plus a newline; produced in blocks, column by column from the bound
 * tables, so neither an object per row nor the whole text is ever held.
 */
export function panelDataJson(head: Omit<BundlePanelData, "data">, data: Record<string, { described: Described; table: RowTable }>): Iterable<Uint8Array> {
  return utf8Blocks(pieces(head, data));
}
