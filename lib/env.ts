import { z } from "zod";
import { decodeUploadToken, LOCAL_UPLOAD_KEYS } from "./uploads/config";

/**
 * Environment, validated once. Every variable has a default that points at the local
 * database and the local fakes, so a fresh clone runs with nothing set. With
 * APP_ENV=production the secrets have no default and a missing one stops the start.
 */
const appEnv = z.enum(["development", "test", "production"]).default("development");

const port = z.coerce.number().int().min(1).max(65535);

const baseSchema = z.object({
  APP_ENV: appEnv,
  APP_URL: z.url().default("http://127.0.0.1:3000"),
  DB_HOST: z.string().min(1).default("127.0.0.1"),
  DB_PORT: port.default(3307),
  DB_USER: z.string().min(1).default("app"),
  DB_PASSWORD: z.string().default("app-local-password"),
  DB_NAME: z
    .string()
    .regex(/^[A-Za-z0-9_]+$/, "letters, digits and _ only")
    .default("loopwright"),
  DB_TEST_NAME: z
    .string()
    .regex(/^[A-Za-z0-9_]+$/)
    .default("loopwright_test"),
  NEXTAUTH_SECRET: z.string().min(16).default("local-dev-secret-not-for-production"),
  /**
   * How many proxies in front of the app append to X-Forwarded-For. 0: the header is ignored and
   * the client address is the connection's own (lib/server/client-address.ts).
   */
  TRUSTED_PROXY_HOPS: z.coerce.number().int().min(0).max(10).default(0),
  CURRENCY: z.string().length(3).toUpperCase().default("GBP"),
  /** The time zone people's times are typed and shown in (site visits); an IANA name. */
  APP_TIME_ZONE: z
    .string()
    .refine((tz) => {
      try {
        new Intl.DateTimeFormat("en-GB", { timeZone: tz });
        return true;
      } catch {
        return false;
      }
    }, "an IANA time zone such as Europe/London")
    .default("Europe/London"),
  PLATFORM_FEE_PERCENT: z.coerce.number().min(0).max(50).default(12),
  REQUEST_EXPIRY_DAYS: z.coerce.number().int().min(1).max(365).default(30),
  DISPUTE_WINDOW_DAYS: z.coerce.number().int().min(1).max(60).default(7),
  SMTP_HOST: z.string().min(1).default("127.0.0.1"),
  SMTP_PORT: port.default(2525),
  MAIL_FROM: z.string().min(3).default("Loopwright <no-reply@loopwright.test>"),
  MAIL_FAKE_URL: z.url().default("http://127.0.0.1:2580"),
  STRIPE_SECRET_KEY: z.string().startsWith("sk_").default("sk_test_local"),
  STRIPE_WEBHOOK_SECRET: z.string().startsWith("whsec_").default("whsec_local"),
  STRIPE_API_HOST: z.string().default("127.0.0.1"),
  STRIPE_API_PORT: port.default(12111),
  STRIPE_API_PROTOCOL: z.enum(["http", "https"]).default("http"),
  UPLOADTHING_TOKEN: z
    .string()
    .refine(
      (t) => {
        try {
          decodeUploadToken(t);
          return true;
        } catch {
          return false;
        }
      },
      { message: "must be the upload service's base64 JSON token with apiKey and appId" },
    )
    .optional(),
  UPLOADTHING_INGEST_URL: z.url().default("http://127.0.0.1:2590"),
  UPLOADTHING_API_URL: z.url().optional(),
  /** Where stored files are read (`<this>/f/<key>`); the ingest URL when unset (the local fake). */
  UPLOADTHING_FILES_URL: z.url().optional(),
});

export type Env = z.infer<typeof baseSchema>;

const productionSecrets = [
  "NEXTAUTH_SECRET",
  "STRIPE_SECRET_KEY",
  "STRIPE_WEBHOOK_SECRET",
  "DB_PASSWORD",
  // Without it the SDK would sign and verify upload callbacks with the public local key.
  "UPLOADTHING_TOKEN",
] as const;

export class EnvError extends Error {}

/** Parse an environment (process.env by default); throws EnvError naming each bad variable. */
export function parseEnv(source: Record<string, string | undefined> = process.env): Env {
  const cleaned = Object.fromEntries(
    Object.entries(source).filter(([, v]) => v !== undefined && v !== ""),
  );
  const result = baseSchema.safeParse(cleaned);
  if (!result.success) {
    const lines = result.error.issues.map((i) => `  ${i.path.join(".")}: ${i.message}`);
    throw new EnvError(`Invalid environment variables:\n${lines.join("\n")}`);
  }
  if (result.data.APP_ENV === "production") {
    const missing = productionSecrets.filter((name) => !cleaned[name]);
    if (missing.length > 0) {
      throw new EnvError(`Missing environment variables for production: ${missing.join(", ")}`);
    }
    if (decodeUploadToken(result.data.UPLOADTHING_TOKEN!).apiKey === LOCAL_UPLOAD_KEYS.apiKey) {
      throw new EnvError(
        "UPLOADTHING_TOKEN: the local development key is public and cannot be used in production",
      );
    }
  }
  return result.data;
}

let cached: Env | undefined;

/** The process environment, parsed on first use. */
export function env(): Env {
  cached ??= parseEnv();
  return cached;
}
