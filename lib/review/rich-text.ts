/**
 * Comment bodies are Tiptap JSON documents. This module checks their shape against an allow-list
 * of nodes and marks, renders them to HTML with every text escaped, and collects @mentions.
 * Anything outside the allow-list is refused (not dropped), so the author sees what was wrong:
 * unknown nodes, marks, keys and attributes, and nesting deeper than MAX_DEPTH. The shape is
 * checked first without recursion, so the renderer's recursion is bounded.
 */

export interface RichTextNode {
  type: string;
  text?: string;
  attrs?: Record<string, unknown>;
  marks?: Array<{ type: string; attrs?: Record<string, unknown> }>;
  content?: RichTextNode[];
}

export class RichTextError extends Error {
  constructor(
    readonly path: string,
    message: string,
  ) {
    super(`${path}: ${message}`);
  }
}

const BLOCKS: Record<string, string> = { paragraph: "p", bulletList: "ul", orderedList: "ol", listItem: "li", codeBlock: "pre", blockquote: "blockquote" };
const MARKS: Record<string, string> = { bold: "strong", italic: "em", code: "code", strike: "s" };
const SAFE_SCHEMES = /^(https?:|mailto:)/i;
const MAX_NODES = 5000;
const MAX_TEXT = 20_000;
/** Nodes inside one another, the document being level 1: room for lists nested about eight deep. */
export const MAX_DEPTH = 20;

const own = (table: Record<string, string>, key: unknown): string | undefined =>
  typeof key === "string" && Object.hasOwn(table, key) ? table[key] : undefined;

/** The keys each node type may carry, and its attributes, as the editor (StarterKit + Mention) writes them. */
const NODE_SHAPES: Record<string, { keys: readonly string[]; attrs?: readonly string[] }> = {
  doc: { keys: ["type", "content"] },
  text: { keys: ["type", "text", "marks"] },
  hardBreak: { keys: ["type", "marks"] },
  mention: { keys: ["type", "attrs", "marks"], attrs: ["id", "label", "mentionSuggestionChar"] },
  paragraph: { keys: ["type", "content"] },
  bulletList: { keys: ["type", "content"] },
  listItem: { keys: ["type", "content"] },
  blockquote: { keys: ["type", "content"] },
  orderedList: { keys: ["type", "content", "attrs"], attrs: ["start", "type"] },
  codeBlock: { keys: ["type", "content", "attrs"], attrs: ["language"] },
};
const MARK_ATTRS: Record<string, readonly string[]> = { bold: [], italic: [], code: [], strike: [], link: ["href", "target", "rel", "class", "title"] };

const isPlainObject = (v: unknown): v is Record<string, unknown> => v !== null && typeof v === "object" && !Array.isArray(v);

function checkAttrs(attrs: unknown, allowed: readonly string[], path: string, owner: string): void {
  if (!isPlainObject(attrs)) throw new RichTextError(path, "expected an object of attributes");
  for (const [k, v] of Object.entries(attrs)) {
    if (!allowed.includes(k)) throw new RichTextError(`${path}.${k}`, `${JSON.stringify(k)} is not allowed on ${owner}`);
    if (v !== null && typeof v !== "string" && typeof v !== "number" && typeof v !== "boolean") {
      throw new RichTextError(`${path}.${k}`, "expected a string, number, true/false or null");
    }
  }
}

function checkMarks(marks: unknown, path: string): void {
  if (!Array.isArray(marks)) throw new RichTextError(path, "expected a list");
  marks.forEach((m, i) => {
    const at = `${path}[${i}]`;
    if (!isPlainObject(m)) throw new RichTextError(at, "expected a mark object");
    const allowed = typeof m.type === "string" && Object.hasOwn(MARK_ATTRS, m.type) ? MARK_ATTRS[m.type] : undefined;
    if (!allowed) throw new RichTextError(at, `mark "${String(m.type)}" is not allowed`);
    for (const k of Object.keys(m)) {
      if (k !== "type" && !(k === "attrs" && allowed.length))
        throw new RichTextError(`${at}.${k}`, `${JSON.stringify(k)} is not allowed on a ${String(m.type)} mark`);
    }
    if (m.attrs !== undefined) checkAttrs(m.attrs, allowed, `${at}.attrs`, `a ${String(m.type)} mark`);
  });
}

/**
 * The document's shape, walked with an explicit stack in document order: node types, keys,
 * attributes and marks against the allow-list, the node count, and the nesting depth.
 */
function checkShape(doc: unknown): void {
  const stack: Array<{ node: unknown; path: string; depth: number }> = [{ node: doc, path: "body", depth: 1 }];
  let nodes = 0;
  while (stack.length) {
    const { node, path, depth } = stack.pop()!;
    if (!isPlainObject(node)) throw new RichTextError(path, "expected a node object");
    if (depth > MAX_DEPTH) throw new RichTextError(path, `nested more than ${MAX_DEPTH} levels deep`);
    if (++nodes > MAX_NODES) throw new RichTextError(path, `more than ${MAX_NODES} nodes`);
    const type = node.type;
    const shape = typeof type === "string" && Object.hasOwn(NODE_SHAPES, type) ? NODE_SHAPES[type] : undefined;
    if (!shape || (type === "doc" && depth > 1)) throw new RichTextError(path, `node "${String(type)}" is not allowed`);
    for (const k of Object.keys(node)) {
      if (!shape.keys.includes(k)) throw new RichTextError(`${path}.${k}`, `${JSON.stringify(k)} is not allowed on a ${String(type)} node`);
    }
    if (node.attrs !== undefined) checkAttrs(node.attrs, shape.attrs ?? [], `${path}.attrs`, `a ${String(type)} node`);
    if (node.marks !== undefined) checkMarks(node.marks, `${path}.marks`);
    if (node.content !== undefined) {
      if (!Array.isArray(node.content)) throw new RichTextError(`${path}.content`, "expected a list");
      if (nodes + node.content.length > MAX_NODES) throw new RichTextError(`${path}.content`, `more than ${MAX_NODES} nodes`);
      for (let i = node.content.length - 1; i >= 0; i--) stack.push({ node: node.content[i], path: `${path}.content[${i}]`, depth: depth + 1 });
    }
  }
}

const escapeHtml = (s: string) => s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;").replace(/'/g, "&#39;");

function safeHref(href: unknown): string | null {
  if (typeof href !== "string") return null;
  const trimmed = href.trim();
  // Control characters and whitespace inside the scheme are how "java\tscript:" slips past naive checks.
  // eslint-disable-next-line no-control-regex -- matching control characters is the point here
  if (/[\u0000-\u001f\u007f\s]/.test(trimmed.split(":")[0] ?? "")) return null;
  return SAFE_SCHEMES.test(trimmed) ? trimmed : null;
}

interface Walk {
  nodes: number;
  chars: number;
  visible: number;
  mentions: Set<string>;
}

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
    case "doc":
      return children();
    case "text": {
      if (typeof n.text !== "string") throw new RichTextError(`${path}.text`, "expected text");
      w.chars += n.text.length;
      w.visible += n.text.trim().length;
      if (w.chars > MAX_TEXT) throw new RichTextError(path, `longer than ${MAX_TEXT} characters`);
      let html = escapeHtml(n.text);
      for (const [i, m] of (n.marks ?? []).entries()) {
        if (m.type === "link") {
          const href = safeHref(m.attrs?.href);
          if (!href) throw new RichTextError(`${path}.marks[${i}]`, "links must start with http:, https: or mailto:");
          html = `<a href="${escapeHtml(href)}" rel="noopener noreferrer nofollow" target="_blank">${html}</a>`;
        } else if (own(MARKS, m.type)) {
          html = `<${own(MARKS, m.type)}>${html}</${own(MARKS, m.type)}>`;
        } else throw new RichTextError(`${path}.marks[${i}]`, `mark "${String(m.type)}" is not allowed`);
      }
      return html;
    }
    case "hardBreak":
      return "<br>";
    case "mention": {
      const id = n.attrs?.id;
      const label = n.attrs?.label;
      if (typeof id !== "string" || !id) throw new RichTextError(`${path}.attrs.id`, "a mention needs a member id");
      w.mentions.add(id);
      return `<span class="mention" data-user="${escapeHtml(id)}">@${escapeHtml(typeof label === "string" ? label : id)}</span>`;
    }
    default: {
      const tag = own(BLOCKS, n.type);
      if (!tag) throw new RichTextError(path, `node "${String(n.type)}" is not allowed`);
      const inner = children();
      return tag === "pre" ? `<pre><code>${inner}</code></pre>` : `<${tag}>${inner}</${tag}>`;
    }
  }
}

/** Validates and renders; throws RichTextError naming the place of the first problem. */
/** `visibleLength` counts text that is not white space: a comment of spaces says nothing. */
export function renderRichText(doc: unknown): { html: string; mentions: string[]; plainLength: number; visibleLength: number } {
  if (!doc || typeof doc !== "object" || (doc as RichTextNode).type !== "doc")
    throw new RichTextError("body", 'expected a Tiptap document ({ "type": "doc", … })');
  checkShape(doc);
  const w: Walk = { nodes: 0, chars: 0, visible: 0, mentions: new Set() };
  const html = renderNode(doc, "body", w);
  return { html, mentions: [...w.mentions], plainLength: w.chars, visibleLength: w.visible };
}

/** A plain-text comment as a document, for scripts and tests. */
export function plainDoc(text: string): RichTextNode & Record<string, unknown> {
  return { type: "doc", content: text.split(/\n{2,}/).map((p) => ({ type: "paragraph", content: p ? [{ type: "text", text: p }] : [] })) };
}
