"use client";
import { useQueryClient } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useCallback, useState } from "react";
import { useDropzone } from "react-dropzone";
import { Button, Field, Select, TextInput } from "@/components/ui";
import { fileStem, parseTags } from "./format";
import { KIND_OPTIONS } from "./measurement-kinds";
import { UploadItemRow } from "./upload-item-row";
import { useUploadQueue } from "./use-upload-queue";

interface BatchFields {
  kind: string;
  sample: string;
  tags: string;
}

function batchMetadata(fields: BatchFields): Record<string, unknown> {
  const meta: Record<string, unknown> = {};
  if (fields.kind) meta.kind = fields.kind;
  if (fields.sample.trim()) meta.sample = fields.sample.trim();
  const { tags } = parseTags(fields.tags);
  if (Object.keys(tags).length) meta.tags = tags;
  return meta;
}

/**
 * Drop several files (or one new version of a dataset when `datasetId` is given). Each file goes up
 * on its own request with a progress bar and a Cancel; the server's answer is shown per file.
 */
export function UploadDropZone({ manuscriptId, datasetId }: { manuscriptId: string; datasetId?: string }) {
  const router = useRouter();
  const queryClient = useQueryClient();
  const [fields, setFields] = useState<BatchFields>({ kind: "", sample: "", tags: "" });
  const tagError = parseTags(fields.tags).error;
  const newVersion = Boolean(datasetId);

  const onIdle = useCallback(() => router.refresh(), [router]);
  const onStored = useCallback(() => {
    void queryClient.invalidateQueries({ queryKey: ["datasets", manuscriptId] });
  }, [manuscriptId, queryClient]);
  const { items, add, cancel, clearFinished } = useUploadQueue({ url: `/api/manuscripts/${manuscriptId}/datasets`, onStored, onIdle });

  const onDrop = useCallback(
    (files: File[]) => {
      if (!files.length || tagError) return;
      add(
        files.map((file) => {
          const form = new FormData();
          if (datasetId) form.append("datasetId", datasetId);
          else {
            form.append("name", fileStem(file.name));
            form.append("metadata", JSON.stringify(batchMetadata(fields)));
          }
          form.append("file", file, file.name);
          return { file, form };
        }),
      );
    },
    [add, datasetId, fields, tagError],
  );

  const { getRootProps, getInputProps, isDragActive, open } = useDropzone({
    onDrop,
    multiple: !newVersion,
    noClick: true,
    noKeyboard: true,
    disabled: Boolean(tagError),
  });
  const finished = items.some((it) => it.status === "stored" || it.status === "failed" || it.status === "cancelled");

  return (
    <div className="space-y-3">
      {newVersion ? null : (
        <fieldset className="grid gap-3 sm:grid-cols-3">
          <legend className="mb-2 text-xs text-muted">Applied to every file of the next batch; all optional, and editable later.</legend>
          <Field label="Measurement kind">
            <Select value={fields.kind} onChange={(e) => setFields({ ...fields, kind: e.target.value })}>
              <option value="">Not set (Other)</option>
              {KIND_OPTIONS.map(([value, label]) => (
                <option key={value} value={value}>
                  {label}
                </option>
              ))}
            </Select>
          </Field>
          <Field label="Sample">
            <TextInput value={fields.sample} onChange={(e) => setFields({ ...fields, sample: e.target.value })} placeholder="e.g. K17" />
          </Field>
          <Field label="Tags" hint="key=value, key=value" error={tagError}>
            <TextInput value={fields.tags} onChange={(e) => setFields({ ...fields, tags: e.target.value })} placeholder="group=annealed, centre=NV03" />
          </Field>
        </fieldset>
      )}
      <div
        {...getRootProps({
          className: `flex flex-col items-center justify-center gap-2 rounded-sm border-2 border-dashed px-4 text-center text-sm ${newVersion ? "py-4" : "py-8"} ${isDragActive ? "border-accent bg-accent-soft" : "border-rule bg-paper/60"}`,
        })}
        data-testid="drop-zone"
      >
        <input {...getInputProps({ "aria-label": newVersion ? "File for the new version" : "Files to upload" })} data-testid="upload-input" />
        <p className="font-medium">
          <span aria-hidden>⇪ </span>
          {isDragActive ? "Drop to upload" : newVersion ? "Drop the file of the new version here" : "Drop measurement files here"}
        </p>
        <p className="text-xs text-muted">CSV, TSV, text columns or JSON; the original bytes are kept as they are.</p>
        <Button type="button" variant="quiet" onClick={open} disabled={Boolean(tagError)}>
          {newVersion ? "Choose a file…" : "Choose files…"}
        </Button>
      </div>
      {items.length ? (
        <div>
          <div className="flex items-center justify-between">
            <h3 className="text-sm font-semibold">Uploads</h3>
            {finished ? (
              <button type="button" onClick={clearFinished} className="text-xs text-accent underline">
                Clear finished
              </button>
            ) : null}
          </div>
          <ul className="divide-y divide-rule" aria-label="Uploads">
            {items.map((it) => (
              <UploadItemRow key={it.key} item={it} onCancel={() => cancel(it.key)} />
            ))}
          </ul>
        </div>
      ) : null}
    </div>
  );
}
