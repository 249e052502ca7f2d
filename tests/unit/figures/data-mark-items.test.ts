import { describe, expect, it } from "vitest";
import type { View } from "vega";
import { dataMarkItems } from "@/components/figures/vega-render";

/** A stand-in for a rendered view: only the scenegraph is read. */
const viewOf = (root: unknown) => ({ scenegraph: () => ({ root }) }) as unknown as View;
const group = (role: string, children: unknown[]) => ({ marktype: "group", role, items: [{ items: children }] });

describe("dataMarkItems: did the render draw anything", () => {
  const axis = group("axis", [
    { marktype: "rule", role: "axis-tick", items: [{}, {}, {}] },
    { marktype: "text", role: "axis-label", items: [{}, {}] },
  ]);

  it("counts the items of data marks only, through nested groups (layers, concat cells)", () => {
    const root = group("frame", [
      axis,
      group("scope", [
        { marktype: "symbol", role: "mark", items: [{}, {}] },
        { marktype: "line", role: "mark", items: [{}] },
      ]),
    ]);
    expect(dataMarkItems(viewOf(root))).toBe(3);
  });

  it("0 when the data marks are empty although axes are drawn; null when the view has no data mark", () => {
    expect(dataMarkItems(viewOf(group("frame", [axis, { marktype: "symbol", role: "mark", items: [] }])))).toBe(0);
    expect(dataMarkItems(viewOf(group("frame", [axis])))).toBeNull();
  });
});
