import "server-only";
import { env } from "@/lib/env";
import { ROLE_LABELS } from "@/lib/authz/policy";
import type { Role } from "@/db/schema";
import type { MailMessage } from "./outbox";

const escapeHtml = (s: string) => s.replace(/&/g, "&amp;").replace(/</g, "&lt;").replace(/>/g, "&gt;").replace(/"/g, "&quot;");

export function layout(title: string, paragraphs: string[], link: { href: string; label: string }): string {
  const body = paragraphs.map((p) => `<p style="margin:0 0 12px">${escapeHtml(p)}</p>`).join("");
  return `<!doctype html><html><body style="font-family:Inter,Arial,sans-serif;color:#1f2328;background:#f7f5f0;padding:24px">
<div style="max-width:560px;margin:auto;background:#fff;border:1px solid #ddd8cc;padding:24px">
<h1 style="font-size:18px;margin:0 0 16px">${escapeHtml(title)}</h1>${body}
<p><a href="${escapeHtml(link.href)}" style="display:inline-block;padding:8px 14px;background:#1d4e89;color:#fff;text-decoration:none">${escapeHtml(link.label)}</a></p>
<p style="font-size:12px;color:#555">Or paste this address into your browser: ${escapeHtml(link.href)}</p>
</div></body></html>`;
}

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
    html: layout("Sign in to Prooflight", lines, { href, label: "Sign in" }),
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
    html: layout("You are invited to review figures", lines, { href, label: "Accept the invitation" }),
  };
}
