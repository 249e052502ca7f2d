"use client";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useState, useTransition } from "react";
import { ApiError, fetchJson, sendJson } from "@/components/api-client";
import { Button, Field, Notice } from "@/components/ui";
import { formatDate, shortHash } from "@/lib/data/format";
import type { ManuscriptView } from "./review-api";
import { StateBadge } from "./state-badge";
import { PrintCheckList } from "@/components/figures/print-check-list";
import { OpenIssuesList, WithdrawSignoff, type OpenIssue } from "./signoff-extras";

export interface SignoffBoxProps {
  figureId: string;
  figureHash: string;
  reviewState: string;
  canSignOff: boolean;
  signoffs: Array<{
    id: string;
    userId: string;
    figureHash: string;
    reason: string;
    createdAt: string | Date;
    stale: boolean;
    withdrawnAt?: string | Date | null;
    withdrawnBy?: string | null;
    withdrawReason?: string | null;
  }>;
}

function postSignoff(figureId: string, body: { figureHash: string; reason?: string }) {
  return sendJson<{ id: string; figureHash: string; openIssues: string[] }>(`/api/figures/${figureId}/signoff`, "POST", body);
}

/** The open issues a refused sign-off lists in its details (a reason is then asked for), else null. */
function openIssuesOf(err: ApiError | null): string[] | null {
  const open = (err?.details as { open?: unknown } | undefined)?.open;
  return Array.isArray(open) ? (open as string[]) : null;
}

/** The print-check failures a refused sign-off carries in its details. */
function printFailuresOf(err: ApiError | null): string[] {
  const lines = (err?.details as { printCheck?: unknown } | undefined)?.printCheck;
  return Array.isArray(lines) ? (lines as string[]) : [];
}

/** The open issues, panel by panel, a refused sign-off carries in its details. */
function issuesOf(err: ApiError | null): OpenIssue[] {
  const issues = (err?.details as { issues?: unknown } | undefined)?.issues;
  return Array.isArray(issues) ? (issues as OpenIssue[]) : [];
}

/** An error answer as `fallback`: the names are a nicety, the box works without them. */
const orWhenRefused = <T,>(p: Promise<T>, fallback: T): Promise<T> =>
  p.catch((e: unknown) => {
    if (e instanceof ApiError) return fallback;
    throw e;
  });

/** Names of the manuscript's members, for saying who signed off (the props carry only user ids). */
function useMemberNames(figureId: string, enabled: boolean) {
  const queryClient = useQueryClient();
  return useQuery({
    queryKey: ["figure-member-names", figureId],
    enabled,
    staleTime: 5 * 60_000,
    // A page that already holds the manuscript (the figure status page) answers from its cache without a request.
    initialData: () => {
      for (const [, m] of queryClient.getQueriesData<ManuscriptView>({ queryKey: ["manuscript"] })) {
        if (m?.figures.some((f) => f.id === figureId)) return Object.fromEntries(m.members.map((u) => [u.userId, u.name]));
      }
      return undefined;
    },
    queryFn: async () => {
      const fig = await orWhenRefused(fetchJson<{ manuscriptId?: string } | null>(`/api/figures/${figureId}`), null);
      if (!fig?.manuscriptId) return {};
      const m = await orWhenRefused(fetchJson<{ items: Array<{ userId: string; name: string }> }>(`/api/manuscripts/${fig.manuscriptId}/members`), {
        items: [],
      });
      return Object.fromEntries(m.items.map((u) => [u.userId, u.name]));
    },
  });
}

/** The server names the field first ("reason: open issues …"); a person reads the sentence. */
const sentence = (m: string) => {
  const t = m.replace(/^reason:\s*/, "");
  return t.charAt(0).toUpperCase() + t.slice(1);
};

/** The figure's review state, its current hash, its sign-offs (stale ones marked) and, for the PI, the sign-off itself. */
export function SignoffBox({ figureId, figureHash, reviewState, canSignOff, signoffs }: SignoffBoxProps) {
  const router = useRouter();
  const queryClient = useQueryClient();
  const [, startTransition] = useTransition();
  const [reason, setReason] = useState("");
  const names = useMemberNames(figureId, signoffs.length > 0).data ?? {};
  const sign = useMutation({
    mutationFn: (withReason: boolean) => postSignoff(figureId, withReason ? { figureHash, reason: reason.trim() } : { figureHash }),
    onSuccess: () => {
      setReason("");
      startTransition(() => router.refresh());
      void queryClient.invalidateQueries();
    },
  });
  const err = sign.error instanceof ApiError ? sign.error : null;
  const open = openIssuesOf(err);
  const needsReason = err?.status === 400 && open !== null;
  const changed = err?.status === 409;
  const signedOff = reviewState === "signed_off";

  const reload = async () => {
    startTransition(() => router.refresh());
    await queryClient.invalidateQueries();
    sign.reset();
  };

  return (
    <div className="text-sm" data-testid={`signoff-box-${figureId}`}>
      <p className="flex flex-wrap items-center gap-2 text-xs text-muted">
        <StateBadge state={reviewState} />
        <span>
          figure hash{" "}
          <code className="rounded-sm bg-paper px-1 font-mono text-ink" title={figureHash} data-testid="figure-hash">
            {shortHash(figureHash, 12)}
          </code>
        </span>
      </p>

      {signoffs.length ? (
        <ul className="mt-3 space-y-2" aria-label="Sign-offs">
          {signoffs.map((s) => (
            <li key={s.id} className={`border-l-2 pl-2 ${s.stale ? "border-dashed border-warn" : "border-ink"}`}>
              <p className="flex items-start gap-1.5">
                <span aria-hidden className="w-3 text-center">
                  {s.stale || s.withdrawnAt ? "◇" : "◆"}
                </span>
                <span>
                  <span className="font-medium">{names[s.userId] ?? "The PI"}</span> signed off
                </span>
              </p>
              <p className="ml-[1.125rem] text-xs text-muted">
                <time dateTime={new Date(s.createdAt).toISOString()}>{formatDate(s.createdAt)}</time> · hash{" "}
                <code className="font-mono" title={s.figureHash}>
                  {shortHash(s.figureHash, 12)}
                </code>
              </p>
              {s.withdrawnAt ? (
                <p className="ml-[1.125rem] text-xs font-medium text-warn">
                  Sign-off withdrawn by {names[s.withdrawnBy ?? ""] ?? "the PI"} — {s.withdrawReason}
                </p>
              ) : s.stale ? (
                <p className="ml-[1.125rem] text-xs font-medium text-warn">Stale — signed off an earlier version of this figure</p>
              ) : (
                <p className="ml-[1.125rem] text-xs text-good">on the current version</p>
              )}
              {s.reason ? <p className="ml-[1.125rem] text-xs">Reason: “{s.reason}”</p> : null}
              {canSignOff && !s.withdrawnAt && !s.stale ? <WithdrawSignoff figureId={figureId} signoffId={s.id} onDone={() => void reload()} /> : null}
            </li>
          ))}
        </ul>
      ) : (
        <p className="mt-3 text-xs text-muted">
          <span aria-hidden>○ </span>Not signed off yet.
        </p>
      )}

      {!canSignOff ? (
        signedOff ? null : (
          <p className="mt-3 text-xs text-muted">Only the PI signs off a figure.</p>
        )
      ) : signedOff ? null : changed ? (
        <div className="mt-3">
          <Notice ok={false}>
            The figure changed since this page loaded: the hash you saw is no longer current. Look at the figure as it is now before signing off.
          </Notice>
          <Button type="button" variant="quiet" className="mt-2" onClick={() => void reload()}>
            Reload the figure
          </Button>
        </div>
      ) : needsReason ? (
        <form
          className="mt-3 space-y-2"
          onSubmit={(e) => {
            e.preventDefault();
            sign.mutate(true);
          }}
        >
          <div role="alert" className="text-sm text-bad">
            <p className="flex gap-2">
              <span aria-hidden className="font-bold">
                ✕
              </span>
              <span>{sentence(err.message)}</span>
            </p>
            {issuesOf(err).length ? (
              <OpenIssuesList issues={issuesOf(err)} />
            ) : open.length ? (
              <ul className="ml-5 mt-1 list-disc text-ink">
                {open.map((o) => (
                  <li key={o}>{o}</li>
                ))}
              </ul>
            ) : null}
            {printFailuresOf(err).length ? (
              <ul className="ml-5 mt-1 list-disc text-ink" aria-label="Print check failures">
                {printFailuresOf(err).map((o) => (
                  <li key={o}>{o}</li>
                ))}
              </ul>
            ) : null}
          </div>
          <Field label="Reason for signing off with open issues">
            <textarea
              required
              value={reason}
              onChange={(e) => setReason(e.target.value)}
              rows={3}
              maxLength={5000}
              className="w-full rounded-sm border border-rule bg-white px-2.5 py-1.5 text-sm focus:border-accent"
            />
          </Field>
          <div className="flex flex-wrap gap-2">
            <Button type="submit" disabled={sign.isPending || !reason.trim()}>
              {sign.isPending ? "Signing off…" : "Sign off with this reason"}
            </Button>
            <Button
              type="button"
              variant="quiet"
              onClick={() => {
                sign.reset();
                setReason("");
              }}
            >
              Cancel
            </Button>
          </div>
        </form>
      ) : (
        <div className="mt-3">
          {reviewState !== "approved" ? (
            <p className="mb-2 text-xs text-muted">Not every panel is approved on its current revision; signing off now asks for a reason.</p>
          ) : null}
          <div className="mb-2">
            <PrintCheckList figureId={figureId} figureHash={figureHash} failuresOnly mayKeepOlder />
          </div>
          <Button type="button" onClick={() => sign.mutate(false)} disabled={sign.isPending}>
            {sign.isPending ? "Signing off…" : "Sign off this figure"}
          </Button>
          {err ? <Notice ok={false}>{err.message}</Notice> : sign.error ? <Notice ok={false}>{sign.error.message}</Notice> : null}
        </div>
      )}
      {sign.isSuccess && !err ? <Notice ok>Signed off hash {shortHash(sign.data.figureHash, 12)}.</Notice> : null}
    </div>
  );
}
