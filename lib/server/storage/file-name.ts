/**
 * Characters that must never reach a label, a dataset name or a header: controls (C0, C1),
 * format characters (every bidi control — U+061C, U+200E/F, U+202A–E, U+2066–9 — and zero-width
 * characters, soft hyphen, BOM), line and paragraph separators and lone surrogates. Bidi controls in
 * particular let "invoice‮gnp.exe" display as "invoiceexe.png".
 */
import "server-only";

const UNSAFE = /[\p{Cc}\p{Cf}\p{Zl}\p{Zp}\p{Cs}]/gu;

/** Text with the unsafe characters above taken out, composed (NFC). Not trimmed. */
export function stripUnsafeCharacters(text: string): string {
  // With the u flag a paired surrogate is one code point (kept); only lone halves match \p{Cs}.
  return text.replace(UNSAFE, "").normalize("NFC");
}

/** A label for display and Content-Disposition only; never used as a path. */
export function sanitiseFileName(name: string | undefined): string {
  const base = (name ?? "").split(/[\\/]/).pop() ?? "";
  const clean = Array.from(stripUnsafeCharacters(base).trim()).slice(0, 200).join("").trim();
  return clean === "" || clean === "." || clean === ".." ? "upload" : clean;
}

/** RFC 5987 ext-value: encodeURIComponent leaves ' ( ) * ! unescaped; only ! is an attr-char. */
function encodeRfc5987(value: string): string {
  return encodeURIComponent(value).replace(/['()*]/g, (c) => `%${c.charCodeAt(0).toString(16).toUpperCase()}`);
}

/**
 * `attachment` with both an ASCII fallback (`filename="…"`, one `_` per character outside printable
 * ASCII, quotes and backslashes) and the exact UTF-8 name (`filename*=UTF-8''…`). The name is cleaned
 * first, so names stored before cleaning existed cannot carry bidi or control characters out.
 */
export function contentDisposition(fileName: string): string {
  const name = sanitiseFileName(fileName);
  const ascii = Array.from(name, (c) => (/^[\x20-\x7e]$/.test(c) && c !== '"' && c !== "\\" ? c : "_")).join("");
  return `attachment; filename="${ascii}"; filename*=UTF-8''${encodeRfc5987(name)}`;
}
