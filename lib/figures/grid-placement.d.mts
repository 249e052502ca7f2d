/** Types of grid-placement.mjs. */

export interface GridCell {
  row: number;
  col: number;
  span: number;
}
export declare function gridPlacement(panels: Array<{ span?: number }>, columns: number): GridCell[];
