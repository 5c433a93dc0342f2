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
