"use client";
import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import { fetchJson, sendJson } from "@/components/api-client";
import { queryKeys, type ThreadAnchor, type ThreadView } from "@/components/figures/api";
import type { JSONContent } from "./comment-editor";

/** A comment shown before the server has answered: plain text only (client HTML is never rendered). */
export type ShownComment = ThreadView["comments"][number] & { pendingText?: string };
export type ShownThread = Omit<ThreadView, "comments"> & { comments: ShownComment[]; pending?: boolean };

export function useThreads(panelId: string) {
  return useQuery({
    queryKey: queryKeys.threads(panelId),
    queryFn: async () => (await fetchJson<{ items: ShownThread[] }>(`/api/panels/${panelId}/threads`)).items,
    refetchOnWindowFocus: true,
    refetchInterval: 15_000,
  });
}

interface Me {
  id: string;
  name: string;
}
const pendingComment = (me: Me, clientKey: string, text: string): ShownComment => ({
  id: `pending-${clientKey}`,
  body: {},
  html: "",
  mentions: [],
  createdBy: me.id,
  authorName: me.name,
  createdAt: new Date().toISOString(),
  editedAt: null,
  pendingText: text,
});

/** Posting, replying, resolving and editing, with optimistic updates rolled back on failure. */
export function useThreadActions(panelId: string, me: Me) {
  const qc = useQueryClient();
  const key = queryKeys.threads(panelId);
  const settle = () => Promise.all([qc.invalidateQueries({ queryKey: key }), qc.invalidateQueries({ queryKey: queryKeys.panel(panelId) })]);
  const snapshot = async () => {
    await qc.cancelQueries({ queryKey: key });
    return qc.getQueryData<ShownThread[]>(key);
  };
  const rollback = (_e: unknown, _v: unknown, ctx: { before?: ShownThread[] } | undefined) => qc.setQueryData(key, ctx?.before);

  const start = useMutation({
    mutationFn: (v: { body: JSONContent; text: string; anchor: ThreadAnchor | null; revisionId: string; revisionNumber: number; clientKey: string }) =>
      sendJson<ShownThread>(`/api/panels/${panelId}/threads`, "POST", { body: v.body, anchor: v.anchor, revisionId: v.revisionId, clientKey: v.clientKey }),
    onMutate: async (v) => {
      const before = await snapshot();
      const optimistic: ShownThread = {
        id: `pending-${v.clientKey}`,
        panelId,
        revisionId: v.revisionId,
        anchor: v.anchor,
        createdBy: me.id,
        createdAt: new Date().toISOString(),
        resolvedAt: null,
        resolvedBy: null,
        followingReplies: true,
        revisionNumber: v.revisionNumber,
        status: "open",
        pending: true,
        comments: [pendingComment(me, v.clientKey, v.text)],
      };
      qc.setQueryData<ShownThread[]>(key, [...(before ?? []), optimistic]);
      return { before };
    },
    onError: rollback,
    onSettled: settle,
  });

  const reply = useMutation({
    mutationFn: (v: { threadId: string; body: JSONContent; text: string; clientKey: string }) =>
      // Only the new comment comes back: the threads are read again once it settles.
      fetchJson<ShownComment>(`/api/threads/${v.threadId}/comments`, {
        method: "POST",
        headers: { prefer: "return=minimal" },
        body: JSON.stringify({ body: v.body, clientKey: v.clientKey }),
      }),
    onMutate: async (v) => {
      const before = await snapshot();
      qc.setQueryData<ShownThread[]>(
        key,
        (before ?? []).map((t) => (t.id === v.threadId ? { ...t, comments: [...t.comments, pendingComment(me, v.clientKey, v.text)] } : t)),
      );
      return { before };
    },
    onError: rollback,
    onSettled: settle,
  });

  const resolve = useMutation({
    mutationFn: (v: { threadId: string; reopen: boolean }) => sendJson<ShownThread>(`/api/threads/${v.threadId}/resolve`, "POST", { reopen: v.reopen }),
    onMutate: async (v) => {
      const before = await snapshot();
      qc.setQueryData<ShownThread[]>(
        key,
        (before ?? []).map((t) => (t.id === v.threadId ? { ...t, status: v.reopen ? "open" : "resolved" } : t)),
      );
      return { before };
    },
    onError: rollback,
    onSettled: settle,
  });

  const follow = useMutation({
    mutationFn: (v: { threadId: string; following: boolean }) =>
      sendJson<{ threadId: string; following: boolean }>(`/api/threads/${v.threadId}/follow`, "POST", { following: v.following }),
    onMutate: async (v) => {
      const before = await snapshot();
      qc.setQueryData<ShownThread[]>(
        key,
        (before ?? []).map((t) => (t.id === v.threadId ? { ...t, followingReplies: v.following } : t)),
      );
      return { before };
    },
    onError: rollback,
    onSettled: settle,
  });

  const edit = useMutation({
    mutationFn: (v: { commentId: string; body: JSONContent; baseEditedAt: number | null }) =>
      sendJson<ShownThread>(`/api/comments/${v.commentId}`, "PATCH", { body: v.body, baseEditedAt: v.baseEditedAt }),
    onSettled: settle,
  });

  return { start, reply, resolve, follow, edit };
}
