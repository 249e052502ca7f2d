/**
 * Where each panel of a figure sits on its grid, shared by the renderer (plain JavaScript, so the
 * render worker can load it) and the figure page's preview, so both leave out the same y titles.
 */

/**
 * Row and column of each panel on the grid: panels fill a row left to right, and one that does
 * not fit in the rest of a row starts the next.
 */
export function gridPlacement(panels, columns) {
  const cols = Math.max(1, Math.floor(columns ?? 1));
  let row = 0;
  let col = 0;
  return panels.map((panel) => {
    const span = Math.min(cols, Math.max(1, Math.floor(panel.span ?? 1)));
    if (col + span > cols) {
      row += 1;
      col = 0;
    }
    const at = { row, col, span };
    col += span;
    return at;
  });
}
