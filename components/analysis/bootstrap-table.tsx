"use client";
import { formatNumber, formatValueError } from "@/lib/data/format";
import type { FitResult } from "./api";

type Bootstrap = NonNullable<FitResult["bootstrap"]>;
type Interval = Bootstrap["parameters"][number];

const range = (r: Array<number | null>) => (r[0] === null || r[1] === null ? "—" : `${formatNumber(r[0], 4)} … ${formatNumber(r[1], 4)}`);

function Row({ item }: { item: Interval }) {
  return (
    <tr data-testid={`bootstrap-${item.name}`}>
      <th scope="row" className="py-1.5 pr-3 text-left font-mono font-medium">
        {item.name}
      </th>
      <td className="py-1.5 pr-3 tabular-nums">{formatValueError(item.value, item.stderr)}</td>
      <td className="py-1.5 pr-3 tabular-nums">{range(item.interval68)}</td>
      <td className="py-1.5 pr-3 tabular-nums">{range(item.interval95)}</td>
      <td className="py-1.5 pr-3">{item.unit || <span className="text-muted">1</span>}</td>
      <td className="py-1.5 text-xs tabular-nums">
        {item.ratio === null ? (
          <span className="text-muted">no standard error to compare</span>
        ) : item.disagrees ? (
          <span className="text-warn">
            <span aria-hidden className="font-bold">
              ⚠{" "}
            </span>
            {formatNumber(item.ratio, 2)}× — they disagree
          </span>
        ) : (
          <span>
            <span aria-hidden>✓ </span>
            {formatNumber(item.ratio, 2)}× — they agree
          </span>
        )}
      </td>
    </tr>
  );
}

/** The bootstrap's percentile intervals beside the covariance errors, and how far the two agree. */
export function BootstrapTable({ bootstrap }: { bootstrap: Bootstrap }) {
  return (
    <div className="space-y-1">
      <div className="relative overflow-x-auto">
        <table className="w-full text-sm" aria-label="Bootstrap intervals">
          <caption className="pb-1 text-left text-xs uppercase tracking-wide text-muted">
            Bootstrap ({bootstrap.used} of {bootstrap.draws} refits, seed {bootstrap.seed})
          </caption>
          <thead className="text-left text-xs uppercase tracking-wide text-muted">
            <tr className="border-b border-rule">
              <th className="py-1.5 pr-3">Quantity</th>
              <th className="py-1.5 pr-3">Value ± standard error</th>
              <th className="py-1.5 pr-3">68 % interval</th>
              <th className="py-1.5 pr-3">95 % interval</th>
              <th className="py-1.5 pr-3">Unit</th>
              <th className="py-1.5">68 % half-width ÷ standard error</th>
            </tr>
          </thead>
          <tbody className="divide-y divide-rule/70">
            {[...bootstrap.parameters, ...bootstrap.derived].map((item) => (
              <Row key={item.name} item={item} />
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}
