import { Sheet } from "@/components/ui";
import type { SessionUser } from "@/lib/authz";
import { formatDate } from "@/lib/data/format";
import { mailDeliveryFor } from "@/lib/server/mail/delivery";
import { ResendButton } from "./resend-button";

/** For the PI: mail to this manuscript's people that failed for good, with the SMTP answer, and addresses that bounce. */
export async function MailDelivery({ user, manuscriptId }: { user: SessionUser; manuscriptId: string }) {
  const { failed, bounced } = await mailDeliveryFor(user, manuscriptId);
  if (!failed.length && !bounced.length) return null;
  return (
    <Sheet>
      <h2 className="text-sm font-semibold">Mail that did not arrive</h2>
      {bounced.length ? (
        <ul className="mt-2 space-y-1 text-sm" aria-label="Addresses that bounce">
          {bounced.map((b) => (
            <li key={b.email}>
              <span aria-hidden>⚠ </span>
              <strong>{b.email}</strong> bounces: the receiving server answered <q className="break-all font-mono text-xs">{b.answer}</q>{" "}
              <span className="text-xs text-muted">({formatDate(b.at)})</span>
            </li>
          ))}
        </ul>
      ) : null}
      {failed.length ? (
        <ul className="mt-3 divide-y divide-rule text-sm" aria-label="Mails that failed">
          {failed.map((f) => (
            <li key={f.id} className="flex flex-wrap items-start justify-between gap-2 py-2">
              <div className="min-w-0">
                <div>
                  {f.what} to {f.to}{" "}
                  <span className="text-xs text-muted">
                    ({formatDate(f.createdAt)}, {f.attempts} attempts)
                  </span>
                </div>
                <div className="break-all font-mono text-xs text-muted">SMTP: {f.answer || "no answer recorded"}</div>
              </div>
              <ResendButton manuscriptId={manuscriptId} mailId={f.id} />
            </li>
          ))}
        </ul>
      ) : null}
    </Sheet>
  );
}
