import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { RichTextError, plainDoc, renderRichText } from "@/lib/review/rich-text";

const doc = (...content: unknown[]) => ({ type: "doc", content });
const p = (...content: unknown[]) => ({ type: "paragraph", content });
const text = (t: string, marks?: unknown[]) => ({ type: "text", text: t, ...(marks ? { marks } : {}) });

describe("rich text", () => {
  it("renders the allowed nodes and marks", () => {
    const r = renderRichText(
      doc(
        p(text("T2 "), text("fit", [{ type: "bold" }]), text(" see "), text("here", [{ type: "link", attrs: { href: "https://example.org/a?b=1&c=2" } }])),
        { type: "bulletList", content: [{ type: "listItem", content: [p(text("n ≈ 1.8"))] }] },
        { type: "codeBlock", content: [text("S(t) = S0 + A e^{-(t/T2)^n}")] },
      ),
    );
    expect(r.html).toBe(
      '<p>T2 <strong>fit</strong> see <a href="https://example.org/a?b=1&amp;c=2" rel="noopener noreferrer nofollow" target="_blank">here</a></p><ul><li><p>n ≈ 1.8</p></li></ul><pre><code>S(t) = S0 + A e^{-(t/T2)^n}</code></pre>',
    );
  });

  it("escapes text so markup in a comment stays text", () => {
    const r = renderRichText(plainDoc('<script>alert(1)</script><img src=x onerror="alert(2)">'));
    expect(r.html).not.toMatch(/<script|<img/);
    expect(r.html).toContain("&lt;script&gt;");
  });

  it.each([
    ["javascript:alert(1)"],
    ["JaVaScRiPt:alert(1)"],
    ["java\tscript:alert(1)"],
    ["data:text/html,<script>alert(1)</script>"],
    ["vbscript:x"],
    ["//evil.example"],
  ])("refuses the link %s", (href) => {
    expect(() => renderRichText(doc(p(text("x", [{ type: "link", attrs: { href } }]))))).toThrow(RichTextError);
  });

  it("refuses unknown nodes, marks and attributes by place", () => {
    expect(() => renderRichText(doc(p(text("x")), { type: "image", attrs: { src: "x" } }))).toThrow(/body.content\[1\]: node "image" is not allowed/);
    expect(() => renderRichText(doc(p(text("x", [{ type: "textStyle" }]))))).toThrow(/mark "textStyle"/);
    expect(() => renderRichText({ type: "paragraph" })).toThrow(/Tiptap document/);
  });

  it("collects mentions", () => {
    const r = renderRichText(doc(p(text("ping "), { type: "mention", attrs: { id: "demo-pi", label: "Mira" } })));
    expect(r.mentions).toEqual(["demo-pi"]);
    expect(r.html).toContain('<span class="mention" data-user="demo-pi">@Mira</span>');
  });

  it("never throws anything but RichTextError, never emits a tag outside the allow-list", () => {
    fc.assert(
      fc.property(fc.jsonValue({ maxDepth: 6 }), (value) => {
        try {
          const { html } = renderRichText({ type: "doc", content: Array.isArray(value) ? value : [value] });
          for (const tag of html.match(/<\/?([a-z]+)/g) ?? [])
            expect(["p", "ul", "ol", "li", "pre", "code", "blockquote", "strong", "em", "s", "a", "br", "span"]).toContain(tag.replace(/[</]/g, ""));
        } catch (err) {
          expect(err).toBeInstanceOf(RichTextError);
        }
      }),
      { numRuns: 3000 },
    );
  });
});
