/** Per-group descriptive statistics for long-format records (e.g. one row per NV centre). */
import { type Description, describe } from "./describe";

export interface GroupSummary {
  /** The group's key, as a string. */
  group: string;
  summary: Description;
}

type Selector<T, R> = keyof T | ((record: T) => R);

function select<T, R>(record: T, selector: Selector<T, R>): unknown {
  return typeof selector === "function" ? selector(record) : record[selector];
}

/**
 * Groups `records` by `key` (a field name or a function) and describes the numeric `value` of each
 * group (field name, default "value", or a function). Groups keep their first-appearance order;
 * records whose key is null/undefined are skipped; non-numeric values count as non-finite.
 */
export function groupBy<T extends object>(records: readonly T[], key: Selector<T, unknown>, value: Selector<T, number> = "value" as keyof T): GroupSummary[] {
  const groups = new Map<string, number[]>();
  for (const record of records) {
    const k = select(record, key);
    if (k === null || k === undefined) continue;
    const name = String(k);
    const v = select(record, value);
    let list = groups.get(name);
    if (!list) groups.set(name, (list = []));
    list.push(typeof v === "number" ? v : NaN);
  }
  return [...groups.entries()].map(([group, values]) => ({ group, summary: describe(values) }));
}
