/** Mid-ranks (ties share the average rank, 1-based) of the pooled values, and the tie-group sizes. */
export function midRanks(values: readonly number[]): { ranks: number[]; tieSizes: number[] } {
  const order = values.map((v, i) => ({ v, i })).sort((x, y) => x.v - y.v);
  const ranks = new Array<number>(values.length);
  const tieSizes: number[] = [];
  let start = 0;
  while (start < order.length) {
    let end = start + 1;
    while (end < order.length && order[end].v === order[start].v) end++;
    const rank = (start + 1 + end) / 2;
    for (let k = start; k < end; k++) ranks[order[k].i] = rank;
    if (end - start > 1) tieSizes.push(end - start);
    start = end;
  }
  return { ranks, tieSizes };
}
