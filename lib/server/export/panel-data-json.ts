import type { RowTable } from "@/lib/data/table-rows";
import type { BundleBoundData, BundlePanelData } from "./bundle-layout";
import { utf8Blocks } from "./utf8-chunks";

type Described = Omit<BundleBoundData, "rows">;

function* pieces(head: Omit<BundlePanelData, "data">, data: Record<string, { described: Described; table: RowTable }>): Generator<string> {
  yield JSON.stringify(head).slice(0, -1) + ',"data":{';
  let k = 0;
  for (const [name, { described, table }] of Object.entries(data)) {
    // `rows` is the last key of each entry: the description without its closing brace, then the rows.
    yield `${k++ ? "," : ""}${JSON.stringify(name)}:${JSON.stringify(described).slice(0, -1)}${Object.keys(described).length ? "," : ""}"rows":[`;
    const keys = table.names.map((n) => `${JSON.stringify(n)}:`);
    const cells = new Array<string>(keys.length);
    for (let i = 0; i < table.length; i++) {
      for (let j = 0; j < keys.length; j++) cells[j] = keys[j] + JSON.stringify(table.cell(i, j));
      yield `${i ? "," : ""}{${cells.join(",")}}`;
    }
    yield "]}";
  }
  yield "}}\n";
}

/**
 * A panel's data file of the bundle (data/panel-<letter>.json), byte for byte what JSON.stringify of
 * its BundlePanelData gives, plus a newline; produced in blocks, row by row from the bound tables, so
 * neither an object per row nor the whole text is ever held.
 */
export function panelDataJson(head: Omit<BundlePanelData, "data">, data: Record<string, { described: Described; table: RowTable }>): Iterable<Uint8Array> {
  return utf8Blocks(pieces(head, data));
}
