/**
 * Comment bodies are Tiptap JSON documents. This module checks their shape against an allow-list
 * of nodes and marks, renders them to HTML with every text escaped, and collects @mentions.
 * Anything outside the allow-list is refused (not dropped), so the author sees what was wrong.
 */

export interface RichTextNode {
  type: string;
  text?: string;
  attrs?: Record<string, unknown>;
  marks?: Array<{ type: string; attrs?: Record<string, unknown> }>;
  content?: RichTextNode[];
}

export class RichTextError extends Error {
  constructor(readonly path: string, message: string) { super(`${path}: ${message}`); }
}

const BLOCKS: Record<string, string> = { paragraph: "p", bulletList: "ul", orderedList: "ol", listItem: "li", codeBlock: "pre", blockquote: "blockquote" };
const MARKS: Record<string, string> = { bold: "strong", italic: "em", code: "code", strike: "s" };
const SAFE_SCHEMES = /^(https?:|mailto:)/i;
const MAX_NODES = 5000;
const MAX_TEXT = 20_000;

export const escapeHtml = (s: string) =>
  s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;").replace(/'/g, "&#39;");

export function safeHref(href: unknown): string | null {
  if (typeof href !== "string") return null;
  const trimmed = href.trim();
  // Control characters and whitespace inside the scheme are how "java\tscript:" slips past naive checks.
  // eslint-disable-next-line no-control-regex -- matching control characters is the point here
  if (/[\u0000-\u001f\u007f\s]/.test(trimmed.split(":")[0] ?? "")) return null;
  return SAFE_SCHEMES.test(trimmed) ? trimmed : null;
}

interface Walk { nodes: number; chars: number; mentions: Set<string> }

function renderNode(node: unknown, path: string, w: Walk): string {
  if (!node || typeof node !== "object" || Array.isArray(node)) throw new RichTextError(path, "expected a node object");
  const n = node as RichTextNode;
  if (++w.nodes > MAX_NODES) throw new RichTextError(path, `more than ${MAX_NODES} nodes`);
  const children = () => {
    if (n.content === undefined) return "";
    if (!Array.isArray(n.content)) throw new RichTextError(`${path}.content`, "expected a list");
    return n.content.map((c, i) => renderNode(c, `${path}.content[${i}]`, w)).join("");
  };
  switch (n.type) {
    case "doc": return children();
    case "text": {
      if (typeof n.text !== "string") throw new RichTextError(`${path}.text`, "expected text");
      w.chars += n.text.length;
      if (w.chars > MAX_TEXT) throw new RichTextError(path, `longer than ${MAX_TEXT} characters`);
      let html = escapeHtml(n.text);
      for (const [i, m] of (n.marks ?? []).entries()) {
        if (m.type === "link") {
          const href = safeHref(m.attrs?.href);
          if (!href) throw new RichTextError(`${path}.marks[${i}]`, "links must start with http:, https: or mailto:");
          html = `<a href="${escapeHtml(href)}" rel="noopener noreferrer nofollow" target="_blank">${html}</a>`;
        } else if (MARKS[m.type]) {
          html = `<${MARKS[m.type]}>${html}</${MARKS[m.type]}>`;
        } else throw new RichTextError(`${path}.marks[${i}]`, `mark "${String(m.type)}" is not allowed`);
      }
      return html;
    }
    case "hardBreak": return "<br>";
    case "mention": {
      const id = n.attrs?.id;
      const label = n.attrs?.label;
      if (typeof id !== "string" || !id) throw new RichTextError(`${path}.attrs.id`, "a mention needs a member id");
      w.mentions.add(id);
      return `<span class="mention" data-user="${escapeHtml(id)}">@${escapeHtml(typeof label === "string" ? label : id)}</span>`;
    }
    default: {
      const tag = BLOCKS[n.type];
      if (!tag) throw new RichTextError(path, `node "${String(n.type)}" is not allowed`);
      const inner = children();
      return tag === "pre" ? `<pre><code>${inner}</code></pre>` : `<${tag}>${inner}</${tag}>`;
    }
  }
}

/** Validates and renders; throws RichTextError naming the place of the first problem. */
export function renderRichText(doc: unknown): { html: string; mentions: string[]; plainLength: number } {
  if (!doc || typeof doc !== "object" || (doc as RichTextNode).type !== "doc") throw new RichTextError("body", 'expected a Tiptap document ({ "type": "doc", … })');
  const w: Walk = { nodes: 0, chars: 0, mentions: new Set() };
  const html = renderNode(doc, "body", w);
  return { html, mentions: [...w.mentions], plainLength: w.chars };
}

/** A plain-text comment as a document, for scripts and tests. */
export function plainDoc(text: string): RichTextNode & Record<string, unknown> {
  return { type: "doc", content: text.split(/\n{2,}/).map((p) => ({ type: "paragraph", content: p ? [{ type: "text", text: p }] : [] })) };
}
