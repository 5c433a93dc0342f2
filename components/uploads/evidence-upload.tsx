"use client";

import { useRef, useState } from "react";
import { useRouter } from "next/navigation";
import { Upload } from "lucide-react";
import { useUploadThing } from "./helpers";

const MAX_BYTES = 8 * 1024 * 1024;

/** Upload the document behind a credential: one PDF or image, up to 8 MB, checked again on the server. */
export function EvidenceUpload({
  credentialId,
  hasEvidence,
}: {
  credentialId: number;
  hasEvidence: boolean;
}) {
  const router = useRouter();
  const input = useRef<HTMLInputElement>(null);
  const [message, setMessage] = useState<{ ok: boolean; text: string } | null>(null);
  const { startUpload, isUploading } = useUploadThing("credentialEvidence", {
    onClientUploadComplete: (files) => {
      const data = files[0]?.serverData;
      if (data && data.ok) {
        setMessage({ ok: true, text: "Evidence uploaded." });
        router.refresh();
      } else
        setMessage({
          ok: false,
          text: data && !data.ok ? data.error : "The upload did not complete.",
        });
    },
    onUploadError: (e) => setMessage({ ok: false, text: e.message || "The upload failed." }),
  });
  const id = `evidence-${credentialId}`;
  return (
    <div className="mt-2">
      <label
        htmlFor={id}
        className="inline-flex min-h-11 cursor-pointer items-center gap-2 rounded-lg border border-slate-300 bg-white px-3 py-2 text-sm font-semibold hover:bg-slate-100"
      >
        <Upload aria-hidden className="h-4 w-4" />
        {isUploading
          ? "Uploading…"
          : hasEvidence
            ? "Replace document"
            : "Upload document (PDF or image)"}
      </label>
      <input
        ref={input}
        id={id}
        type="file"
        accept="application/pdf,image/jpeg,image/png,image/webp"
        className="sr-only"
        disabled={isUploading}
        onChange={async (e) => {
          const file = e.target.files?.[0];
          e.target.value = "";
          if (!file) return;
          if (file.size > MAX_BYTES)
            return setMessage({ ok: false, text: "That file is over 8 MB." });
          setMessage(null);
          await startUpload([file], { credentialId });
        }}
      />
      <p
        aria-live="polite"
        className={`mt-1 text-sm ${message?.ok ? "text-level-ok" : "text-level-stop"}`}
      >
        {message?.text ?? ""}
      </p>
    </div>
  );
}
