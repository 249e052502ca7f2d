import { describe, expect, it } from "vitest";
import { MAX_DEPTH, renderRichText } from "@/lib/review/rich-text";

const doc = (...content: unknown[]) => ({ type: "doc", content });
const p = (...content: unknown[]) => ({ type: "paragraph", content });
const text = (t: string, extra: Record<string, unknown> = {}) => ({ type: "text", text: t, ...extra });

function quotes(depth: number): unknown {
  let node: unknown = p(text("deep"));
  for (let i = 0; i < depth; i++) node = { type: "blockquote", content: [node] };
  return doc(node);
}

describe("rich text limits", () => {
  it("refuses a document nested 10,000 levels deep with a RichTextError, not a stack overflow", () => {
    expect(() => renderRichText(quotes(10_000))).toThrow(`body${".content[0]".repeat(20)}: nested more than 20 levels deep`);
  });

  it("allows the deepest document within the limit", () => {
    expect(MAX_DEPTH).toBe(20);
    // doc, 17 blockquotes, paragraph, text: 20 levels.
    expect(renderRichText(quotes(17)).html).toBe(`${"<blockquote>".repeat(17)}<p>deep</p>${"</blockquote>".repeat(17)}`);
    expect(() => renderRichText(quotes(18))).toThrow(/nested more than 20 levels deep/);
  });

  it("refuses unknown keys on nodes and marks, and attributes outside the allow-list, by path", () => {
    expect(() => renderRichText(doc(p(text("x", { onclick: "alert(1)" }))))).toThrow(
      'body.content[0].content[0].onclick: "onclick" is not allowed on a text node',
    );
    expect(() => renderRichText({ ...doc(p(text("x"))), meta: {} })).toThrow('body.meta: "meta" is not allowed on a doc node');
    expect(() => renderRichText(doc({ type: "paragraph", attrs: { style: "x" }, content: [] }))).toThrow(
      'body.content[0].attrs: "attrs" is not allowed on a paragraph node',
    );
    expect(() => renderRichText(doc({ type: "codeBlock", attrs: { language: "js", onload: "x" }, content: [] }))).toThrow(
      'body.content[0].attrs.onload: "onload" is not allowed on a codeBlock node',
    );
    expect(() => renderRichText(doc(p(text("x", { marks: [{ type: "bold", attrs: {} }] }))))).toThrow(
      'body.content[0].content[0].marks[0].attrs: "attrs" is not allowed on a bold mark',
    );
    expect(() => renderRichText(doc(p(text("x", { marks: [{ type: "link", attrs: { href: "https://a.example", style: "x" } }] }))))).toThrow(
      'body.content[0].content[0].marks[0].attrs.style: "style" is not allowed on a link mark',
    );
    expect(() => renderRichText(doc(p({ type: "mention", attrs: { id: "u", label: { nested: true } } })))).toThrow(
      "body.content[0].content[0].attrs.label: expected a string, number, true/false or null",
    );
  });

  it("refuses malformed marks and inherited names instead of failing with a TypeError", () => {
    expect(() => renderRichText(doc(p(text("x", { marks: [null] }))))).toThrow("body.content[0].content[0].marks[0]: expected a mark object");
    expect(() => renderRichText(doc(p(text("x", { marks: "bold" }))))).toThrow("body.content[0].content[0].marks: expected a list");
    expect(() => renderRichText(doc({ type: "constructor", content: [] }))).toThrow('body.content[0]: node "constructor" is not allowed');
    expect(() => renderRichText(doc(p(text("x", { marks: [{ type: "toString" }] }))))).toThrow(
      'body.content[0].content[0].marks[0]: mark "toString" is not allowed',
    );
    expect(() => renderRichText(doc(doc(p(text("x")))))).toThrow('body.content[0]: node "doc" is not allowed');
  });

  it("accepts what the editor writes", () => {
    const r = renderRichText(
      doc(
        p(
          text("see "),
          text("here", {
            marks: [{ type: "link", attrs: { href: "https://example.org", target: "_blank", rel: "noopener noreferrer nofollow", class: null, title: null } }],
          }),
          { type: "hardBreak" },
          { type: "mention", attrs: { id: "demo-pi", label: "Mira", mentionSuggestionChar: "@" } },
        ),
        { type: "orderedList", attrs: { start: 1, type: null }, content: [{ type: "listItem", content: [p(text("one"))] }] },
        { type: "codeBlock", attrs: { language: null }, content: [text("x = 1")] },
      ),
    );
    expect(r.html).toBe(
      '<p>see <a href="https://example.org" rel="noopener noreferrer nofollow" target="_blank">here</a><br><span class="mention" data-user="demo-pi">@Mira</span></p><ol><li><p>one</p></li></ol><pre><code>x = 1</code></pre>',
    );
    expect(r.mentions).toEqual(["demo-pi"]);
  });
});
