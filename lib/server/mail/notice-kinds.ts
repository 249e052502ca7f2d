import "server-only";

/** The immediate review notices, each of which a person can turn off. */
export const NOTICE_KINDS = ["review_requested", "needs_revision", "approved", "signoff_due", "signed_off", "approval_stale", "reply", "mention"] as const;
export type NoticeKind = (typeof NOTICE_KINDS)[number];

/** What each kind is, as a person reads it on the preferences and unsubscribe pages. */
export const NOTICE_LABELS: Record<NoticeKind, string> = {
  review_requested: "review requests (a new revision waits for your review)",
  needs_revision: "revision requests on panels you made",
  approved: "approvals of panels you made",
  signoff_due: "figures ready for your sign-off",
  signed_off: "figures signed off",
  approval_stale: "approvals of yours that went stale",
  reply: "replies in threads you wrote in or follow",
  mention: "@mentions",
};

/** What a one-click unsubscribe can turn off: a notice kind, or the digest. */
export const MAIL_LIST_KINDS = [...NOTICE_KINDS, "digest"] as const;
export type MailListKind = (typeof MAIL_LIST_KINDS)[number];
export const MAIL_LIST_LABELS: Record<MailListKind, string> = { ...NOTICE_LABELS, digest: "the daily or weekly digest" };
