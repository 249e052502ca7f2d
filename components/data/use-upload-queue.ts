"use client";
import { useCallback, useEffect, useRef, useState } from "react";
import { sendUpload, type UploadedVersion, type UploadHandle } from "./send-upload";

type UploadStatus = "queued" | "sending" | "checking" | "stored" | "failed" | "cancelled";

export interface UploadItem {
  key: string;
  fileName: string;
  byteSize: number;
  status: UploadStatus;
  loaded: number;
  total: number;
  version?: UploadedVersion;
  error?: string;
}

interface Pending {
  key: string;
  form: FormData;
  retries?: number;
}

/** The server takes two uploads per person at a time; when it is busy the file waits its turn again. */
const MAX_BUSY_RETRIES = 5;

/** Uploads files a few at a time, each with its own progress and its own Cancel. */
export function useUploadQueue({
  url,
  concurrency = 2,
  onStored,
  onIdle,
}: {
  url: string;
  concurrency?: number;
  onStored?: (v: UploadedVersion) => void;
  onIdle?: () => void;
}) {
  const [items, setItems] = useState<UploadItem[]>([]);
  const queue = useRef<Pending[]>([]);
  const running = useRef(new Map<string, UploadHandle>());
  const nextKey = useRef(0);
  const callbacks = useRef({ onStored, onIdle });
  useEffect(() => {
    callbacks.current = { onStored, onIdle };
  }, [onStored, onIdle]);

  const patch = useCallback((key: string, change: Partial<UploadItem>) => {
    setItems((all) => all.map((it) => (it.key === key ? { ...it, ...change } : it)));
  }, []);

  const pump = useCallback(
    function pumpQueue() {
      while (running.current.size < concurrency && queue.current.length) {
        const { key, form, retries = 0 } = queue.current.shift()!;
        patch(key, { status: "sending" });
        const handle = sendUpload(url, form, {
          progress: (loaded, total) => patch(key, { loaded, total }),
          sent: () => patch(key, { status: "checking" }),
        });
        running.current.set(key, handle);
        void handle.done.then((outcome) => {
          running.current.delete(key);
          if (outcome.ok) {
            patch(key, { status: "stored", version: outcome.version });
            callbacks.current.onStored?.(outcome.version);
          } else if (outcome.retryAfterSeconds && retries < MAX_BUSY_RETRIES) {
            patch(key, { status: "queued", loaded: 0, error: `Waiting ${outcome.retryAfterSeconds} s: ${outcome.message}` });
            setTimeout(() => {
              queue.current.push({ key, form, retries: retries + 1 });
              pumpQueue();
            }, outcome.retryAfterSeconds * 1000);
            return;
          } else {
            patch(key, { status: outcome.cancelled ? "cancelled" : "failed", error: outcome.message });
          }
          pumpQueue();
          if (running.current.size === 0 && queue.current.length === 0) callbacks.current.onIdle?.();
        });
      }
    },
    [concurrency, patch, url],
  );

  const add = useCallback(
    (files: Array<{ file: File; form: FormData }>) => {
      const fresh = files.map(({ file, form }) => ({ key: `upload-${++nextKey.current}`, file, form }));
      setItems((all) => [
        ...all,
        ...fresh.map(({ key, file }) => ({
          key,
          fileName: file.name,
          byteSize: file.size,
          status: "queued" as const,
          loaded: 0,
          total: file.size,
        })),
      ]);
      queue.current.push(...fresh.map(({ key, form }) => ({ key, form })));
      pump();
    },
    [pump],
  );

  const cancel = useCallback(
    (key: string) => {
      const handle = running.current.get(key);
      if (handle) {
        handle.abort();
        return;
      }
      queue.current = queue.current.filter((p) => p.key !== key);
      patch(key, { status: "cancelled", error: "Cancelled before sending; nothing was stored." });
    },
    [patch],
  );

  const clearFinished = useCallback(() => {
    setItems((all) => all.filter((it) => it.status === "queued" || it.status === "sending" || it.status === "checking"));
  }, []);

  return { items, add, cancel, clearFinished };
}
