import { messageFromBody } from "@/components/api-client";
import type { VersionView } from "./api";

export type UploadedVersion = VersionView & { deduplicated: boolean };
type UploadOutcome = { ok: true; version: UploadedVersion } | { ok: false; cancelled: boolean; message: string; retryAfterSeconds?: number };

export interface UploadHandle {
  done: Promise<UploadOutcome>;
  abort: () => void;
}

/**
 * One multipart POST through XMLHttpRequest, because fetch cannot report upload progress.
 * The browser adds the Origin header the gate asks of cookie-authenticated writes.
 */
export function sendUpload(url: string, form: FormData, on: { progress: (loaded: number, total: number) => void; sent: () => void }): UploadHandle {
  const xhr = new XMLHttpRequest();
  const done = new Promise<UploadOutcome>((resolve) => {
    xhr.open("POST", url);
    xhr.setRequestHeader("accept", "application/json");
    xhr.upload.onprogress = (e) => {
      if (e.lengthComputable) on.progress(e.loaded, e.total);
    };
    xhr.upload.onload = () => on.sent();
    xhr.onload = () => {
      if (xhr.status >= 200 && xhr.status < 300) {
        try {
          resolve({ ok: true, version: JSON.parse(xhr.responseText) as UploadedVersion });
        } catch {
          resolve({ ok: false, cancelled: false, message: "The server's answer could not be read." });
        }
      } else {
        const retry = xhr.status === 429 ? Number(xhr.getResponseHeader("retry-after")) : NaN;
        resolve({ ok: false, cancelled: false, message: messageFromBody(xhr.status, xhr.responseText), ...(retry > 0 ? { retryAfterSeconds: retry } : {}) });
      }
    };
    xhr.onerror = () => resolve({ ok: false, cancelled: false, message: "The upload did not reach the server (network error). Try again." });
    xhr.onabort = () => resolve({ ok: false, cancelled: true, message: "Cancelled; nothing was stored." });
    xhr.send(form);
  });
  return { done, abort: () => xhr.abort() };
}
