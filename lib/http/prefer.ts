/**
 * The `Prefer: return=minimal` request preference (RFC 7240 §4.2): a client that does not read the
 * resource a write changed asks for only what the write created. Preferences are a comma-separated
 * list; names and the `return` value compare case-insensitively and the value may be quoted.
 */
export function prefersMinimal(req: Request): boolean {
  const header = req.headers.get("prefer");
  if (!header) return false;
  return header.split(",").some((pref) => {
    const [token] = pref.split(";");
    const [name, value = ""] = token.split("=").map((s) => s.trim());
    return name.toLowerCase() === "return" && value.replace(/^"(.*)"$/, "$1").toLowerCase() === "minimal";
  });
}

/** The headers of an answer that honoured (or could have honoured) the preference. */
export function preferenceHeaders(applied: boolean): HeadersInit {
  return applied ? { "Preference-Applied": "return=minimal", Vary: "Prefer" } : { Vary: "Prefer" };
}
