"use client";

import { PHOTO_TAG_LABELS } from "@/lib/labels";
import { StepCaution } from "@/components/ui/caution";
import { useState } from "react";
import { useRouter } from "next/navigation";
import { Upload } from "lucide-react";
import type { ProjectFile } from "@/lib/types/projects";
import { PHOTO_TAGS } from "@/lib/validation/request";
import { inputClass } from "@/components/ui/field";
import { useUploadThing } from "@/components/uploads/helpers";
import { ActionForm } from "@/components/ui/action-form";
import { deleteFile } from "./actions";

const TAG_LABELS = PHOTO_TAG_LABELS;
const MAX_BYTES = 16 * 1024 * 1024;

function Picker({
  id,
  label,
  accept,
  busy,
  onFile,
}: {
  id: string;
  label: string;
  accept: string;
  busy: boolean;
  onFile: (f: File) => void;
}) {
  return (
    <>
      <label
        htmlFor={id}
        className="inline-flex min-h-12 cursor-pointer items-center gap-2 rounded-lg bg-copper-600 px-4 py-2 font-semibold text-white hover:bg-copper-700"
      >
        <Upload aria-hidden className="h-5 w-5" /> {busy ? "Uploading…" : label}
      </label>
      <input
        id={id}
        type="file"
        accept={accept}
        className="sr-only"
        disabled={busy}
        onChange={(e) => {
          const f = e.target.files?.[0];
          e.target.value = "";
          if (f) onFile(f);
        }}
      />
    </>
  );
}

/** The project's sketch and photos: upload (checked by content on the server), caption and tag, thumbnails, delete. */
export function ProjectFiles({ projectId, files }: { projectId: number; files: ProjectFile[] }) {
  const router = useRouter();
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const [caption, setCaption] = useState("");
  const [tag, setTag] = useState<(typeof PHOTO_TAGS)[number]>("collector");
  const done = (
    files: { serverData: { ok: true; attachmentId: number } | { ok: false; error: string } }[],
  ) => {
    const d = files[0]?.serverData;
    if (d?.ok) {
      setMessage({ ok: true, text: "Uploaded." });
      setCaption("");
      router.refresh();
    } else setMessage({ ok: false, text: d && !d.ok ? d.error : "The upload did not complete." });
  };
  const onUploadError = (e: Error) =>
    setMessage({ ok: false, text: e.message || "The upload failed." });
  const sketch = useUploadThing("sketch", { onClientUploadComplete: done, onUploadError });
  const photo = useUploadThing("photo", { onClientUploadComplete: done, onUploadError });
  const guard = (f: File) => {
    if (f.size > MAX_BYTES) {
      setMessage({ ok: false, text: "That file is over 16 MB." });
      return false;
    }
    setMessage(null);
    return true;
  };
  const sketches = files.filter((f) => f.purpose === "sketch");
  const photos = files.filter((f) => f.purpose === "photo");
  const thumb = (f: ProjectFile) =>
    f.mimeType.startsWith("image/") ? (
      // eslint-disable-next-line @next/next/no-img-element -- private files come from our access-checked route, not the image optimiser
      <img
        src={`/api/files/${f.id}?variant=thumbnail`}
        alt={f.caption ?? f.fileName}
        className="h-32 w-full rounded-lg object-cover"
      />
    ) : (
      <a
        href={`/api/files/${f.id}`}
        target="_blank"
        rel="noreferrer"
        className="flex h-32 items-center justify-center rounded-lg bg-slate-100 font-semibold underline"
      >
        PDF: {f.fileName}
      </a>
    );
  return (
    <div className="space-y-5">
      <div className="flex flex-wrap items-end gap-3">
        <Picker
          id="sketch-file"
          label="Upload the system sketch"
          accept="application/pdf,image/jpeg,image/png,image/webp"
          busy={sketch.isUploading}
          onFile={(f) => guard(f) && sketch.startUpload([f], { projectId })}
        />
      </div>
      <div className="flex flex-wrap items-end gap-3 rounded-lg border border-slate-200 p-3">
        <label className="text-sm font-semibold">
          Photo caption
          <input
            className={inputClass}
            value={caption}
            onChange={(e) => setCaption(e.target.value)}
            maxLength={200}
            placeholder="e.g. vessel on its cooling leg"
          />
        </label>
        <label className="text-sm font-semibold">
          Shows
          <select
            className={inputClass}
            value={tag}
            onChange={(e) => setTag(e.target.value as (typeof PHOTO_TAGS)[number])}
          >
            {PHOTO_TAGS.map((t) => (
              <option key={t} value={t}>
                {TAG_LABELS[t]}
              </option>
            ))}
          </select>
        </label>
        <Picker
          id="photo-file"
          label="Add a photo"
          accept="image/jpeg,image/png,image/webp"
          busy={photo.isUploading}
          onFile={(f) => guard(f) && photo.startUpload([f], { projectId, caption, tag })}
        />
      </div>
      {tag === "roof" || tag === "collector" ? <StepCaution step="roofPhotos" /> : null}
      <p aria-live="polite" className={message?.ok ? "text-level-ok" : "text-level-stop"}>
        {message?.text ?? ""}
      </p>
      <ul className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3" aria-label="Sketch and photos">
        {[...sketches, ...photos].map((f) => (
          <li
            key={f.id}
            className="rounded-card border border-slate-200 bg-white p-3"
            data-file={f.purpose}
          >
            {thumb(f)}
            <p className="mt-2 text-sm font-semibold">
              {f.purpose === "sketch" ? "System sketch" : TAG_LABELS[f.tag ?? "other"]}
            </p>
            <p className="text-sm text-slate-600">{f.caption ?? f.fileName}</p>
            <ActionForm
              action={deleteFile}
              fields={{ projectId, attachmentId: f.id }}
              submitLabel="Delete"
              pendingLabel="Deleting…"
              buttonAriaLabel={`Delete ${f.caption ?? f.fileName}`}
              className="mt-2"
              variant="danger-ghost"
              buttonSize="small"
            />
          </li>
        ))}
      </ul>
    </div>
  );
}
