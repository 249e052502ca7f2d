import type { RowTable } from "@/lib/data/table-rows";
import type { BundleBoundData, BundlePanelData } from "./bundle-layout";
import { Utf8Chunks } from "./utf8-chunks";

type Described = Omit<BundleBoundData, "rows">;

/**
 * A panel's data file of the bundle (data/panel-<letter>.json), byte for byte what JSON.stringify of
 * its BundlePanelData gives, plus a newline; written row by row from the bound tables, so no
 * object is made per row and the text is held once, as bytes.
 */
export function panelDataJson(head: Omit<BundlePanelData, "data">, data: Record<string, { described: Described; table: RowTable }>): Uint8Array {
  const out = new Utf8Chunks();
  out.push(JSON.stringify(head).slice(0, -1) + ',"data":{');
  Object.entries(data).forEach(([name, { described, table }], k) => {
    // `rows` is the last key of each entry: the description without its closing brace, then the rows.
    out.push(`${k ? "," : ""}${JSON.stringify(name)}:${JSON.stringify(described).slice(0, -1)}${Object.keys(described).length ? "," : ""}"rows":[`);
    const keys = table.names.map((n) => `${JSON.stringify(n)}:`);
    const cells = new Array<string>(keys.length);
    for (let i = 0; i < table.length; i++) {
      for (let j = 0; j < keys.length; j++) cells[j] = keys[j] + JSON.stringify(table.cell(i, j));
      out.push(`${i ? "," : ""}{${cells.join(",")}}`);
    }
    out.push("]}");
  });
  out.push("}}\n");
  return out.bytes();
}
