import "server-only";
import { env } from "@/lib/env";
import { ROLE_LABELS } from "@/lib/authz/policy";
import type { Role } from "@/db/schema";
import type { MailMessage } from "./enqueue";
import type { DigestView, NoticesView } from "./render/mail-views.mjs";
import { NOTICE_KINDS, NOTICE_LABELS, type NoticeKind } from "./notice-kinds";
import type { Digest } from "./digest-content";
import { shortTitle } from "./notices";
import { unsubscribeToken } from "./unsubscribe";

export function signInLinkMail(to: string, token: string): MailMessage {
  const href = `${env().appUrl}/sign-in/link?token=${encodeURIComponent(token)}`;
  const lines = [
    "Someone (hopefully you) asked for a link to sign in to Prooflight.",
    "The link works once and expires in 15 minutes. If you did not ask for it, ignore this message.",
  ];
  return {
    kind: "sign_in_link",
    to,
    subject: "Your Prooflight sign-in link",
    text: `${lines.join("\n\n")}\n\nSign in: ${href}\n`,
    view: { kind: "link", heading: "Sign in to Prooflight", paragraphs: lines, button: { href, label: "Sign in" } },
  };
}

export function invitationMail(to: string, token: string, inviter: string, manuscript: string, role: Role): MailMessage {
  const href = `${env().appUrl}/invite/${encodeURIComponent(token)}`;
  const lines = [`${inviter} invited you to the manuscript "${manuscript}" as ${ROLE_LABELS[role]}.`, "The invitation works once and expires in 7 days."];
  return {
    kind: "invitation",
    to,
    subject: `Invitation: ${manuscript}`,
    text: `${lines.join("\n\n")}\n\nAccept: ${href}\n`,
    view: { kind: "link", heading: "You are invited to review figures", paragraphs: lines, button: { href, label: "Accept the invitation" } },
  };
}

interface NoticeRow {
  kind: string;
  subject: string;
  headline: string;
  body: string;
  href: string;
  manuscriptId: string | null;
}

/**
 * One person's pending review notices as one mail: alone, the notice's own subject; several, how
 * many and what they are about. Each is listed with its link, the first `items` of them when there
 * were more (`more` says how many more, pointing to the activity page); the footer and the
 * List-Unsubscribe headers (RFC 2369, one-click per RFC 8058) turn off `kinds`, those of all of them.
 */
export function noticesMail(to: string, userId: string, items: NoticeRow[], more = { count: 0, kinds: [] as string[] }): MailMessage {
  const base = env().appUrl;
  const kinds = [...new Set([...items.map((i) => i.kind), ...more.kinds])].filter((k): k is NoticeKind => (NOTICE_KINDS as readonly string[]).includes(k));
  const token = unsubscribeToken(userId, kinds);
  const page = `${base}/unsubscribe?token=${encodeURIComponent(token)}`;
  const oneClick = `${base}/api/unsubscribe?token=${encodeURIComponent(token)}`;
  const settings = `${base}/settings/mail`;
  const what = kinds.map((k) => NOTICE_LABELS[k]).join(", ");
  const single = items.length === 1 && more.count === 0;
  const subject = single ? items[0].subject : severalSubject(items, more.count);
  const manuscripts = [...new Set(items.map((i) => i.manuscriptId))];
  const rest = more.count
    ? {
        headline: `…and ${more.count.toLocaleString("en-GB")} more`,
        lines: ["Each manuscript's activity page lists everything that happened."],
        href: manuscripts.length === 1 && manuscripts[0] ? `${base}/manuscripts/${manuscripts[0]}/activity` : `${base}/manuscripts`,
      }
    : null;
  const text = [
    ...items.map((i) => `${single ? "" : "• "}${i.headline}\n${i.body}\nOpen: ${i.href}\n`),
    ...(rest ? [`• ${rest.headline}\n${rest.lines.join("\n")}\nOpen: ${rest.href}\n`] : []),
    `—\nStop mails about ${what}: ${page}\nChoose which mails you get: ${settings}\n`,
  ].join("\n");
  const view: NoticesView = {
    kind: "notices",
    heading: single ? items[0].headline : subject,
    items: [...items.map((i) => ({ headline: single ? null : i.headline, lines: i.body.split("\n"), href: i.href })), ...(rest ? [rest] : [])],
    footer: { stop: { href: page, label: `Stop mails about ${what}` }, settings: { href: settings, label: "Choose which mails you get" } },
  };
  return {
    kind: single ? items[0].kind : "notices",
    to,
    subject,
    text,
    view,
    headers: { "List-Unsubscribe": `<${oneClick}>`, "List-Unsubscribe-Post": "List-Unsubscribe=One-Click" },
  };
}

function severalSubject(items: NoticeRow[], more: number): string {
  const manuscripts = new Set(items.map((i) => i.manuscriptId));
  const about = items.map((i) => i.headline).join("; ");
  const where = manuscripts.size === 1 ? ` on ${items[0].subject.split(" — ").at(-1)}` : "";
  const s = `${items.length + more} updates${where}: ${about}`;
  return s.length > 200 ? `${s.slice(0, 199).trimEnd()}…` : s;
}

/** "Friday 2 January at 08:00" in the reader's own time zone. */
function localMoment(d: Date, timeZone: string): string {
  return new Intl.DateTimeFormat("en-GB", { timeZone, weekday: "long", day: "numeric", month: "long", hour: "2-digit", minute: "2-digit" }).format(d);
}

const figureHeading = (f: { number: number; title: string }) => `Figure ${f.number}${f.title ? ` “${f.title}”` : ""}`;

/**
 * A person's digest: what happened on their manuscripts since the last one, grouped by manuscript
 * then figure, each line with its link; the footer and List-Unsubscribe headers turn the digest off.
 */
export function digestMail(to: string, userId: string, d: Digest): MailMessage {
  const base = env().appUrl;
  const token = unsubscribeToken(userId, ["digest"]);
  const page = `${base}/unsubscribe?token=${encodeURIComponent(token)}`;
  const oneClick = `${base}/api/unsubscribe?token=${encodeURIComponent(token)}`;
  const settings = `${base}/settings/mail`;
  const which = d.frequency === "daily" ? "Daily" : "Weekly";
  const updates = `${d.count} ${d.count === 1 ? "update" : "updates"}`;
  const where = d.manuscripts.length === 1 ? shortTitle(d.manuscripts[0].title) : `${d.manuscripts.length} manuscripts`;
  const intro = `What happened on your manuscripts since ${localMoment(d.since, d.timeZone)} (${d.timeZone}).`;
  const text = [
    `${which} digest for ${d.name}`,
    intro,
    ...d.manuscripts.map((m) =>
      [`== ${m.title}`, m.href, ...m.figures.map((f) => [``, `${figureHeading(f)}`, ...f.lines.map((l) => `- ${l.text}\n  ${l.href}`)].join("\n"))].join("\n"),
    ),
    `—\nStop the digest: ${page}\nChoose when it comes and which mails you get: ${settings}\n`,
  ].join("\n\n");
  const view: DigestView = {
    kind: "digest",
    heading: `${which} digest`,
    intro,
    manuscripts: d.manuscripts.map((m) => ({
      title: m.title,
      href: m.href,
      figures: m.figures.map((f) => ({ heading: figureHeading(f), href: f.href, lines: f.lines.map((l) => ({ text: l.text, href: l.href })) })),
    })),
    footer: { stop: { href: page, label: "Stop the digest" }, settings: { href: settings, label: "Choose when it comes and which mails you get" } },
  };
  return {
    kind: "digest",
    to,
    subject: `${which} digest: ${updates} on ${where}`,
    text,
    view,
    headers: { "List-Unsubscribe": `<${oneClick}>`, "List-Unsubscribe-Post": "List-Unsubscribe=One-Click" },
  };
}
