/**
 * Lining up a figure's axes: panels that start in the same grid column get the same left margin
 * before their plotting area (so their y axes stand one above the other), and panels in one row
 * the same top margin — and the same bottom margin when they are equally tall — so their plots
 * start and end on one line. Margins only grow: the padding added to a panel is the widest
 * margin of its column or row less its own. Plain JavaScript (typed by align-core.d.mts) so the
 * render worker can load it.
 */

/** Below this (pt, about 0.1 mm) two edges count as lined up. */
export const ALIGN_TOLERANCE_PT = 0.25;

const SAME_HEIGHT_PT = 0.5;

/**
 * Padding to add to each panel, pt: `{ left, top, bottom }`. `panels[i]` has `plot` (margins of
 * its plotting area, or null) and `height` (pt); `cells[i]` its grid row and column.
 */
export function alignmentPadding(panels, cells) {
  const maxBy = (indices, key) => Math.max(...indices.map((i) => panels[i].plot[key]));
  const group = (keyOf) => {
    const groups = new Map();
    panels.forEach((p, i) => {
      if (!p.plot) return;
      const k = keyOf(cells[i]);
      groups.set(k, [...(groups.get(k) ?? []), i]);
    });
    return [...groups.values()];
  };
  const out = panels.map(() => ({ left: 0, top: 0, bottom: 0 }));
  for (const members of group((c) => c.col)) {
    const left = maxBy(members, "left");
    for (const i of members) out[i].left = left - panels[i].plot.left;
  }
  for (const members of group((c) => c.row)) {
    const top = maxBy(members, "top");
    for (const i of members) out[i].top = top - panels[i].plot.top;
    const heights = members.map((i) => panels[i].height);
    if (Math.max(...heights) - Math.min(...heights) > SAME_HEIGHT_PT) continue;
    const bottom = maxBy(members, "bottom");
    for (const i of members) out[i].bottom = bottom - panels[i].plot.bottom;
  }
  return out;
}

/** Whether every shift is below the tolerance. */
export function isAligned(padding) {
  return padding.every((p) => p.left < ALIGN_TOLERANCE_PT && p.top < ALIGN_TOLERANCE_PT && p.bottom < ALIGN_TOLERANCE_PT);
}
