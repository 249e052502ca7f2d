import type { UnitRole } from "./models/types";

const INVERSE: Record<string, string> = { s: "Hz", ms: "kHz", µs: "MHz", ns: "GHz", ps: "THz", Hz: "s", kHz: "ms", MHz: "µs", GHz: "ns" };

/** A fit parameter's unit from its role and the column units (1/µs reads as MHz, as a physicist writes it). */
export function resolveUnit(role: UnitRole, xUnit: string | null, yUnit: string | null): string {
  const x = xUnit ?? "";
  const y = yUnit ?? "";
  switch (role) {
    case "x":
      return x;
    case "y":
      return y;
    case "1":
      return "";
    case "1/x":
      return x ? (INVERSE[x] ?? `1/${x}`) : "";
    case "x*y":
      return [x, y].filter(Boolean).join("·");
    case "y/x":
      return x ? `${y || "1"}/${x}` : y;
    case "y/x^2":
      return x ? `${y || "1"}/${x}²` : y;
    case "y/x^3":
      return x ? `${y || "1"}/${x}³` : y;
  }
}
