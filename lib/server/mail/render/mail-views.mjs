/**
 * The HTML of every mail, as react-email components. Plain JavaScript (React.createElement, no JSX)
 * because it runs in the mail render child (./mail-render-child.mjs), a plain Node process: React
 * cannot render to HTML under the react-server condition that Next's server code and our tsx scripts
 * use. Types: ./mail-views.d.mts. Every string arrives as text and React escapes it; comment
 * excerpts were already reduced to text by the comment sanitiser.
 *
 * Look: the app's palette (app/globals.css) — paper, sheet, rule, ink, muted, accent — with a dark
 * variant for clients that honour prefers-color-scheme; no images, so nothing is lost with images off.
 */
import { createElement as h, Fragment } from "react";
import { Body, Container, Head, Heading, Hr, Html, Link, Preview, Section, Text, render } from "@react-email/components";

const C = { paper: "#f7f5f0", sheet: "#ffffff", rule: "#ddd8cc", ink: "#1f2328", muted: "#5b6168", accent: "#1d4e89", accentSoft: "#e4ecf6" };
const FONT = "Inter, -apple-system, 'Segoe UI', Roboto, Arial, sans-serif";

// Clients that honour it (Apple Mail, iOS, some webmail) switch to these; the others keep the light look, readable either way.
const DARK = `
:root { color-scheme: light dark; supported-color-schemes: light dark; }
@media (prefers-color-scheme: dark) {
  html, body, .pl-body, .pl-body > table > tbody > tr > td { background: #16181b !important; }
  .pl-sheet { background: #1f2328 !important; border-color: #3a3f45 !important; }
  .pl-ink { color: #ece9e2 !important; }
  .pl-muted { color: #a8aeb5 !important; }
  .pl-link { color: #9cc0ec !important; }
  .pl-button { background: #9cc0ec !important; color: #16181b !important; }
  .pl-rule { border-color: #3a3f45 !important; }
  .pl-figure { border-color: #34506f !important; }
}`;

const text = { color: C.ink, fontSize: "15px", lineHeight: "22px", margin: "0 0 12px" };
const small = { color: C.muted, fontSize: "12px", lineHeight: "18px", margin: "0 0 6px" };
const link = { color: C.accent, textDecoration: "underline" };

function Layout({ preview, heading, children, footer }) {
  return h(
    Html,
    { lang: "en" },
    h(
      Head,
      null,
      h("meta", { name: "color-scheme", content: "light dark" }),
      h("meta", { name: "supported-color-schemes", content: "light dark" }),
      h("style", null, DARK),
    ),
    h(Preview, null, preview),
    h(
      Body,
      { className: "pl-body", style: { background: C.paper, fontFamily: FONT, margin: 0, padding: "24px 0" } },
      h(
        Container,
        { className: "pl-sheet", style: { background: C.sheet, border: `1px solid ${C.rule}`, maxWidth: "600px", padding: "24px 28px" } },
        h(Text, { className: "pl-muted", style: { ...small, letterSpacing: "0.08em", textTransform: "uppercase", margin: "0 0 16px" } }, "Prooflight"),
        h(Heading, { as: "h1", className: "pl-ink", style: { color: C.ink, fontSize: "20px", lineHeight: "28px", margin: "0 0 16px" } }, heading),
        children,
        footer ? h(Fragment, null, h(Hr, { className: "pl-rule", style: { borderColor: C.rule, margin: "24px 0 12px" } }), footer) : null,
      ),
    ),
  );
}

/** A link whose address is also written out, for clients that strip links or show text only. */
function LinkWithAddress({ href, label }) {
  return h(
    Text,
    { className: "pl-ink", style: { ...text, margin: "0 0 4px" } },
    h(Link, { href, className: "pl-link", style: link }, label),
    h("br"),
    h("span", { className: "pl-muted", style: { color: C.muted, fontSize: "12px", wordBreak: "break-all" } }, href),
  );
}

function Footer({ stop, settings }) {
  return h(
    Text,
    { className: "pl-muted", style: small },
    h(Link, { href: stop.href, className: "pl-muted", style: { color: C.muted, textDecoration: "underline" } }, stop.label),
    " · ",
    h(Link, { href: settings.href, className: "pl-muted", style: { color: C.muted, textDecoration: "underline" } }, settings.label),
  );
}

/** A sign-in link or an invitation: a few sentences and one button, with the address written out. */
function LinkMail(v) {
  return h(
    Layout,
    { preview: v.paragraphs[0] ?? v.heading, heading: v.heading },
    ...v.paragraphs.map((p, i) => h(Text, { key: i, className: "pl-ink", style: text }, p)),
    h(
      Section,
      { style: { margin: "20px 0" } },
      h(
        Link,
        {
          href: v.button.href,
          className: "pl-button",
          style: {
            background: C.accent,
            color: "#ffffff",
            display: "inline-block",
            fontSize: "15px",
            fontWeight: 600,
            padding: "10px 18px",
            textDecoration: "none",
          },
        },
        v.button.label,
      ),
    ),
    h(Text, { className: "pl-muted", style: small }, "Or paste this address into your browser:"),
    h(Text, { className: "pl-muted", style: { ...small, wordBreak: "break-all" } }, v.button.href),
  );
}

/** One or several review notices, each with what happened and its link. */
function NoticesMail(v) {
  return h(
    Layout,
    { preview: v.heading, heading: v.heading, footer: h(Footer, v.footer) },
    ...v.items.map((item, i) =>
      h(
        Section,
        { key: i, style: { margin: "0 0 20px" } },
        item.headline ? h(Heading, { as: "h2", className: "pl-ink", style: { color: C.ink, fontSize: "16px", margin: "0 0 8px" } }, item.headline) : null,
        ...item.lines.map((l, j) => h(Text, { key: j, className: "pl-ink", style: { ...text, margin: "0 0 8px" } }, l)),
        h(LinkWithAddress, { href: item.href, label: "Open it in Prooflight" }),
      ),
    ),
  );
}

/** A digest: by manuscript, then figure, each line a link. */
function DigestMail(v) {
  return h(
    Layout,
    { preview: v.intro, heading: v.heading, footer: h(Footer, v.footer) },
    h(Text, { className: "pl-ink", style: text }, v.intro),
    ...v.manuscripts.map((m, i) =>
      h(
        Section,
        { key: i, style: { margin: "20px 0 0" } },
        h(
          Heading,
          { as: "h2", style: { fontSize: "17px", lineHeight: "24px", margin: "0 0 4px" } },
          h(Link, { href: m.href, className: "pl-ink", style: { color: C.ink, textDecoration: "none" } }, m.title),
        ),
        ...m.figures.map((f, j) =>
          h(
            Section,
            { key: j, className: "pl-figure", style: { borderLeft: `3px solid ${C.accentSoft}`, margin: "12px 0 0", paddingLeft: "12px" } },
            h(
              Heading,
              { as: "h3", style: { fontSize: "15px", margin: "0 0 6px" } },
              h(Link, { href: f.href, className: "pl-ink", style: { color: C.ink, textDecoration: "none" } }, f.heading),
            ),
            ...f.lines.map((l, k) =>
              h(
                Text,
                { key: k, className: "pl-ink", style: { ...text, margin: "0 0 6px" } },
                "• ",
                h(Link, { href: l.href, className: "pl-link", style: link }, l.text),
              ),
            ),
          ),
        ),
      ),
    ),
  );
}

const VIEWS = { link: LinkMail, notices: NoticesMail, digest: DigestMail };

/** One mail view to HTML. */
export async function renderMailView(view) {
  const component = VIEWS[view?.kind];
  if (!component) throw new Error(`unknown mail view "${view?.kind}"`);
  return render(h(component, view));
}
