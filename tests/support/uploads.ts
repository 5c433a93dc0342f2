/**
 * Drives the upload protocol the way @uploadthing/react does in a browser: ask the app's
 * route handler for presigned URLs, then PUT the file to the (fake) ingest server.
 */
export const tinyPdf = () =>
  Buffer.from(
    "%PDF-1.4\n1 0 obj<</Type/Catalog/Pages 2 0 R>>endobj\n2 0 obj<</Type/Pages/Kids[]/Count 0>>endobj\ntrailer<</Root 1 0 R>>\n%%EOF\n",
  );
/** A whole 2 × 2 PNG (made with sharp): it sniffs as PNG and decodes, so it survives re-encoding. */
export const tinyPng = () =>
  Buffer.from(
    "89504e470d0a1a0a0000000d4948445200000002000000020802000000fdd49a730000000970485973000003e8000003e801b57b526b0000001249444154089963705955eeb2aa9c01420100264e05957f0bbb540000000049454e44ae426082",
    "hex",
  );
/** The PNG signature and header chunk, then a script: sniffs as PNG, does not decode. */
export const pngPolyglot = () =>
  Buffer.concat([
    Buffer.from("89504e470d0a1a0a0000000d4948445200000001000000010806000000", "hex"),
    Buffer.from("<script>alert(document.domain)</script>"),
  ]);
/** The first bytes of a Linux executable. */
export const elfBytes = () =>
  Buffer.concat([Buffer.from([0x7f, 0x45, 0x4c, 0x46, 2, 1, 1, 0]), Buffer.alloc(120)]);

export interface UploadAttempt {
  presignStatus: number;
  presignBody: unknown;
  putStatus?: number;
  putBody?: { serverData?: { ok: boolean; error?: string; attachmentId?: number }; error?: string };
}

export async function uploadViaApp(
  baseUrl: string,
  cookie: string,
  slug: string,
  input: unknown,
  file: { name: string; type: string; bytes: Buffer; declaredSize?: number },
): Promise<UploadAttempt> {
  const res = await fetch(`${baseUrl}/api/uploadthing?actionType=upload&slug=${slug}`, {
    method: "POST",
    headers: {
      "content-type": "application/json",
      cookie,
      "x-uploadthing-package": "@uploadthing/react",
      "x-uploadthing-version": "7.7.4",
    },
    body: JSON.stringify({
      files: [
        {
          name: file.name,
          size: file.declaredSize ?? file.bytes.length,
          type: file.type,
          lastModified: Date.now(),
        },
      ],
      input,
    }),
  });
  const presignBody = await res.json().catch(() => null);
  if (!res.ok) return { presignStatus: res.status, presignBody };
  const [{ url }] = presignBody as [{ url: string; key: string }];
  const form = new FormData();
  form.append("file", new Blob([new Uint8Array(file.bytes)], { type: file.type }), file.name);
  const put = await fetch(url, { method: "PUT", body: form });
  return {
    presignStatus: res.status,
    presignBody,
    putStatus: put.status,
    putBody: (await put.json()) as UploadAttempt["putBody"],
  };
}
