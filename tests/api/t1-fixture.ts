/** A small T1 relaxation file (30 waits) and a point spec reading it, shared by API tests that need bound data. */
export const T1_SPEC = {
  $schema: "https://vega.github.io/schema/vega-lite/v6.json",
  data: { name: "t1" },
  mark: "point",
  encoding: { x: { field: "wait", type: "quantitative", title: "wait (ms)" }, y: { field: "p", type: "quantitative", title: "PL (norm.)" } },
};

export const T1_CSV =
  "wait (ms),p\n" +
  Array.from({ length: 30 }, (_, i) => {
    const t = 0.05 * 1.25 ** i;
    return `${t},${(0.7 + 0.3 * Math.exp(-t / 4) + 0.002 * Math.sin(7 * i)).toFixed(5)}`;
  }).join("\n");
