import "server-only";
import type { BoundInput } from "@/db/schema";
import { reduceForDisplay } from "@/lib/data/display-reduction";
import { loadBoundTables } from "./bindings";

/** Each bound table as the browser gets it: whole when short, reduced to its extremes when long. */
export async function displayDataFor(bound: Record<string, BoundInput>) {
  const tables = await loadBoundTables(bound);
  return Object.fromEntries(Object.entries(tables).map(([name, t]) => [name, reduceForDisplay(t)]));
}
