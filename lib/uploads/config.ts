/**
 * Upload-service settings shared by the app and the local fake. In production
 * UPLOADTHING_TOKEN (and no ingest override) points the SDK at the real service.
 */
export const LOCAL_UPLOAD_KEYS = {
  apiKey: "sk_local_loopwright_uploads",
  appId: "loopwrightlocal",
  regions: ["local"],
} as const;

export function localUploadToken(): string {
  return Buffer.from(JSON.stringify(LOCAL_UPLOAD_KEYS)).toString("base64");
}

export function decodeUploadToken(token: string): { apiKey: string; appId: string } {
  const parsed = JSON.parse(Buffer.from(token, "base64").toString("utf8")) as {
    apiKey?: string;
    appId?: string;
  };
  if (!parsed.apiKey || !parsed.appId)
    throw new Error("UPLOADTHING_TOKEN must be base64 JSON with apiKey and appId");
  return { apiKey: parsed.apiKey, appId: parsed.appId };
}

/** At most this many live files of each kind per project. */
export const PROJECT_FILE_LIMITS = { sketch: 3, photo: 20 } as const;

/** The largest file of each kind, in bytes, checked against the stored bytes. */
export const MAX_FILE_BYTES = {
  credentialEvidence: 8 * 1024 * 1024,
  sketch: 16 * 1024 * 1024,
  photo: 16 * 1024 * 1024,
} as const;
/** A file key as the upload service makes them (and as the fake accepts them). */
const FILE_KEY = /^[A-Za-z0-9_-]{1,200}$/;

/**
 * The URL to read a stored file from, or null when `url` is not a file on the configured file
 * host (`filesBaseUrl`, the ingest URL locally): same origin, and a path of the form
 * `/f/<key>`. The app sends its API key with the request, so any other host — one named in
 * a forged callback, say — is never contacted.
 */
export function trustedStoredFileUrl(url: string, filesBaseUrl: string): URL | null {
  let target: URL;
  let base: URL;
  try {
    target = new URL(url);
    base = new URL(filesBaseUrl);
  } catch {
    return null;
  }
  if (target.origin !== base.origin || target.username || target.password) return null;
  const prefix = base.pathname.replace(/\/+$/, "");
  const rest = target.pathname.startsWith(`${prefix}/f/`)
    ? target.pathname.slice(prefix.length + 3)
    : null;
  if (!rest || !FILE_KEY.test(rest)) return null;
  return target;
}
