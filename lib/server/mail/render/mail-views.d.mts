/** The data each mail's HTML is drawn from (see mail-views.mjs); plain JSON, stored with the outbox row. */
export interface FooterLinks {
  stop: { href: string; label: string };
  settings: { href: string; label: string };
}

export interface LinkView {
  kind: "link";
  heading: string;
  paragraphs: string[];
  button: { href: string; label: string };
}

export interface NoticesView {
  kind: "notices";
  heading: string;
  items: Array<{ headline: string | null; lines: string[]; href: string }>;
  footer: FooterLinks;
}

export interface DigestView {
  kind: "digest";
  heading: string;
  intro: string;
  manuscripts: Array<{ title: string; href: string; figures: Array<{ heading: string; href: string; lines: Array<{ text: string; href: string }> }> }>;
  footer: FooterLinks;
}

export type MailView = LinkView | NoticesView | DigestView;

export function renderMailView(view: MailView): Promise<string>;
