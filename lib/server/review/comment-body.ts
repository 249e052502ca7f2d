import "server-only";
import sanitizeHtml from "sanitize-html";
import { RichTextError, renderRichText } from "@/lib/review/rich-text";
import { badRequest } from "@/lib/errors";

const POLICY: sanitizeHtml.IOptions = {
  allowedTags: ["p", "ul", "ol", "li", "pre", "code", "blockquote", "strong", "em", "s", "a", "br", "span"],
  allowedAttributes: { a: ["href", "rel", "target"], span: ["class", "data-user"] },
  allowedSchemes: ["http", "https", "mailto"],
  allowProtocolRelative: false,
  disallowedTagsMode: "escape",
};

/** Checks a Tiptap document, renders it, and passes the HTML through the allow-list sanitiser as a second wall. */
export function prepareCommentBody(body: unknown, memberIds: Set<string>): { html: string; mentions: string[] } {
  let rendered;
  try {
    rendered = renderRichText(body);
  } catch (err) {
    if (err instanceof RichTextError) throw badRequest(err.message);
    throw err;
  }
  if (rendered.visibleLength === 0 && rendered.mentions.length === 0) throw badRequest("body: the comment is empty (write some text or @mention someone).");
  const stranger = rendered.mentions.find((m) => !memberIds.has(m));
  if (stranger) throw badRequest(`body: @mention of "${stranger}", who is not a member of this manuscript.`);
  return { html: sanitizeHtml(rendered.html, POLICY), mentions: rendered.mentions };
}

const ENTITIES: Record<string, string> = { "&amp;": "&", "&lt;": "<", "&gt;": ">", "&quot;": '"', "&#39;": "'", "&nbsp;": " " };

/**
 * A stored comment as plain text for a mail (notices, digests): through the same sanitiser with
 * nothing allowed, block ends kept as spaces, cut at `max` characters with an ellipsis.
 */
export function commentExcerpt(html: string, max = 300): string {
  const spaced = html.replace(/<\/(p|li|pre|blockquote)>|<br\s*\/?>/gi, "$& ");
  const text = sanitizeHtml(spaced, { allowedTags: [], allowedAttributes: {} })
    .replace(/&(amp|lt|gt|quot|#39|nbsp);/g, (e) => ENTITIES[e] ?? e)
    .replace(/\s+/g, " ")
    .trim();
  return text.length > max ? `${text.slice(0, max - 1).trimEnd()}…` : text;
}
