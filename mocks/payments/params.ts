/**
 * Errors in the payment service's wire shape, and a reader for form-encoded parameters that
 * refuses unknown keys, so a typo in the app's call fails here as it would against the
 * service. Values arrive as strings; an empty string means "unset".
 */
import type { Metadata } from "./types";

export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly type: string,
    message: string,
    readonly code?: string,
    readonly param?: string,
    readonly extra: Record<string, unknown> = {},
  ) {
    super(message);
  }

  body() {
    return {
      error: {
        type: this.type,
        ...(this.code ? { code: this.code } : {}),
        message: this.message,
        ...(this.param ? { param: this.param } : {}),
        ...this.extra,
      },
    };
  }
}

export const invalid = (message: string, param?: string, code = "parameter_invalid") =>
  new ApiError(400, "invalid_request_error", message, code, param);

export const missing = (kind: string, id: string, param = "id") =>
  new ApiError(404, "invalid_request_error", `No such ${kind}: '${id}'`, "resource_missing", param);

type Raw = Record<string, unknown>;

const isObject = (v: unknown): v is Raw => typeof v === "object" && v !== null && !Array.isArray(v);

export class Params {
  private readonly used = new Set<string>();
  private readonly children: Params[] = [];

  constructor(
    private readonly raw: Raw,
    private readonly prefix = "",
  ) {}

  name(key: string) {
    return this.prefix ? `${this.prefix}[${key}]` : key;
  }

  has(key: string): boolean {
    const v = this.raw[key];
    return v !== undefined && v !== "";
  }

  private take(key: string): unknown {
    this.used.add(key);
    const v = this.raw[key];
    return v === "" ? undefined : v;
  }

  str(key: string, max = 5000): string | undefined {
    const v = this.take(key);
    if (v === undefined) return undefined;
    if (typeof v !== "string") throw invalid(`Invalid string: ${this.name(key)}`, this.name(key));
    if (v.length > max)
      throw invalid(`${this.name(key)} is longer than ${max} characters`, this.name(key));
    return v;
  }

  reqStr(key: string, max?: number): string {
    const v = this.str(key, max);
    if (v === undefined) throw this.missingParam(key);
    return v;
  }

  url(key: string): string | undefined {
    const v = this.str(key, 5000);
    if (v === undefined) return undefined;
    try {
      const u = new URL(v.replace(/\{CHECKOUT_SESSION_ID\}/g, "x"));
      if (u.protocol !== "http:" && u.protocol !== "https:") throw new Error("scheme");
    } catch {
      throw invalid(`Not a valid URL: ${this.name(key)}`, this.name(key), "url_invalid");
    }
    return v;
  }

  reqUrl(key: string): string {
    const v = this.url(key);
    if (v === undefined) throw this.missingParam(key);
    return v;
  }

  int(key: string, min = 0, max = 99_999_999): number | undefined {
    const v = this.take(key);
    if (v === undefined) return undefined;
    if (typeof v !== "string" || !/^-?\d+$/.test(v))
      throw invalid(
        `Invalid integer: ${String(v)} for ${this.name(key)}`,
        this.name(key),
        "parameter_invalid_integer",
      );
    const n = Number(v);
    if (n < min) throw invalid(`${this.name(key)} must be at least ${min}`, this.name(key));
    if (n > max) throw invalid(`${this.name(key)} must be at most ${max}`, this.name(key));
    return n;
  }

  reqInt(key: string, min?: number, max?: number): number {
    const v = this.int(key, min, max);
    if (v === undefined) throw this.missingParam(key);
    return v;
  }

  bool(key: string): boolean | undefined {
    const v = this.take(key);
    if (v === undefined) return undefined;
    if (v === "true") return true;
    if (v === "false") return false;
    throw invalid(`Invalid boolean: ${String(v)} for ${this.name(key)}`, this.name(key));
  }

  oneOf<T extends string>(key: string, values: readonly T[]): T | undefined {
    const v = this.str(key);
    if (v === undefined) return undefined;
    if (!(values as readonly string[]).includes(v))
      throw invalid(
        `Invalid ${this.name(key)}: must be one of ${values.join(", ")}`,
        this.name(key),
        "parameter_invalid_string",
      );
    return v as T;
  }

  reqOneOf<T extends string>(key: string, values: readonly T[]): T {
    const v = this.oneOf(key, values);
    if (v === undefined) throw this.missingParam(key);
    return v;
  }

  currency(key: string): string | undefined {
    const v = this.str(key, 3);
    if (v === undefined) return undefined;
    if (!/^[A-Za-z]{3}$/.test(v))
      throw invalid(`Invalid currency: ${v}`, this.name(key), "parameter_invalid_string");
    return v.toLowerCase();
  }

  reqCurrency(key: string): string {
    const v = this.currency(key);
    if (v === undefined) throw this.missingParam(key);
    return v;
  }

  /**
   * Metadata: undefined when not sent, null when sent as "" (clear all), otherwise the
   * key/value pairs, where a "" value means "remove this key".
   */
  metadata(key = "metadata"): Record<string, string> | null | undefined {
    this.used.add(key);
    const v = this.raw[key];
    if (v === undefined) return undefined;
    if (v === "") return null;
    if (!isObject(v)) throw invalid(`Invalid object: ${this.name(key)}`, this.name(key));
    const out: Record<string, string> = {};
    const entries = Object.entries(v);
    if (entries.length > 50)
      throw invalid("Metadata can have at most 50 keys", this.name(key), "parameter_invalid");
    for (const [k, val] of entries) {
      if (typeof val !== "string")
        throw invalid(`Invalid metadata value for ${k}`, `${this.name(key)}[${k}]`);
      if (k.length > 40)
        throw invalid("Metadata keys can be at most 40 characters", `${this.name(key)}[${k}]`);
      if (val.length > 500)
        throw invalid("Metadata values can be at most 500 characters", `${this.name(key)}[${k}]`);
      out[k] = val;
    }
    return out;
  }

  object(key: string): Params | undefined {
    this.used.add(key);
    const v = this.raw[key];
    if (v === undefined || v === "") return undefined;
    if (!isObject(v)) throw invalid(`Invalid object: ${this.name(key)}`, this.name(key));
    const child = new Params(v, this.name(key));
    this.children.push(child);
    return child;
  }

  /** An object whose keys are not checked (free-form details the fake only stores). */
  loose(key: string): Raw | undefined {
    this.used.add(key);
    const v = this.raw[key];
    if (v === undefined || v === "") return undefined;
    if (!isObject(v)) throw invalid(`Invalid object: ${this.name(key)}`, this.name(key));
    return v;
  }

  /** An array of objects (qs gives an array, or an object with index keys past its limit). */
  list(key: string): Params[] {
    this.used.add(key);
    const v = this.raw[key];
    if (v === undefined || v === "") return [];
    const items = Array.isArray(v) ? v : isObject(v) ? Object.values(v) : null;
    if (!items) throw invalid(`Invalid array: ${this.name(key)}`, this.name(key));
    return items.map((item, i) => {
      if (!isObject(item)) throw invalid(`Invalid object: ${this.name(key)}[${i}]`);
      const child = new Params(item, `${this.name(key)}[${i}]`);
      this.children.push(child);
      return child;
    });
  }

  strings(key: string): string[] {
    this.used.add(key);
    const v = this.raw[key];
    if (v === undefined || v === "") return [];
    const items = Array.isArray(v) ? v : isObject(v) ? Object.values(v) : [v];
    return items.map((s) => {
      if (typeof s !== "string") throw invalid(`Invalid array: ${this.name(key)}`);
      return s;
    });
  }

  /** Throws for any key nobody read, here or in a nested object read through this. */
  done(): void {
    for (const key of Object.keys(this.raw)) {
      if (!this.used.has(key))
        throw invalid(`Unknown parameter: ${this.name(key)}`, this.name(key), "parameter_unknown");
    }
    for (const c of this.children) c.done();
  }

  private missingParam(key: string) {
    return invalid(
      `Missing required parameter: ${this.name(key)}`,
      this.name(key),
      "parameter_missing",
    );
  }
}

/** Apply a metadata update: null clears, "" values remove keys, the rest are set. */
export function mergeMetadata(current: Metadata, update: Record<string, string> | null): Metadata {
  if (update === null) return {};
  const next = { ...current };
  for (const [k, v] of Object.entries(update)) {
    if (v === "") delete next[k];
    else next[k] = v;
  }
  return next;
}

/** New metadata from a create call (no removals to apply). */
export const freshMetadata = (m: Record<string, string> | null | undefined): Metadata =>
  m ? mergeMetadata({}, m) : {};
