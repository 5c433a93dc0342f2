/**
 * Call a server action of the built app over HTTP, the way the browser does and the way anyone
 * with a session cookie can: POST to a page that uses it, with the `Next-Action` header (the id
 * from the build's server-reference manifest) and the arguments encoded by React's own
 * `encodeReply`. Bound arguments (`sendQuote.bind(null, requestId)`) travel in plain sight in the
 * argument list, so a caller may send any values there: that is what these tests do.
 */
import { readFileSync } from "node:fs";
import { createRequire } from "node:module";

const require = createRequire(import.meta.url);
const { encodeReply } = require("next/dist/compiled/react-server-dom-webpack/client.edge") as {
  encodeReply: (value: unknown) => Promise<string | FormData>;
};

interface ManifestEntry {
  workers: Record<string, unknown>;
  filename?: string;
  exportedName?: string;
}

let manifest: Record<string, ManifestEntry> | undefined;
function entries(): Record<string, ManifestEntry> {
  manifest ??= (
    JSON.parse(readFileSync(".next/server/server-reference-manifest.json", "utf8")) as {
      node: Record<string, ManifestEntry>;
    }
  ).node;
  return manifest;
}

/** The action's id and a page route (e.g. `app/(app)/jobs/[id]/page`) whose bundle holds it. */
export function actionRef(name: string): { id: string; workers: string[] } {
  const [file, exportName] = name.split("#");
  for (const [id, e] of Object.entries(entries())) {
    const filename = (e.filename ?? "").replace(/^\.\//, "");
    if (filename === file && e.exportedName === exportName)
      return { id, workers: Object.keys(e.workers) };
  }
  throw new Error(`No action ${name} in the build (is the build older than the code?)`);
}

/** Every action the build knows, as `<file>#<export>`. */
export function builtActionNames(): string[] {
  return Object.values(entries()).map(
    (e) => `${(e.filename ?? "").replace(/^\.\//, "")}#${e.exportedName}`,
  );
}

/** A FormData argument in an action's argument list. */
export function form(fields: Record<string, string | string[]>): FormData {
  const fd = new FormData();
  for (const [k, v] of Object.entries(fields))
    for (const one of Array.isArray(v) ? v : [v]) fd.append(k, one);
  return fd;
}

export interface ActionAnswer {
  status: number;
  /** Where the action redirected (x-action-redirect or Location), if it did. */
  redirect?: string;
  /** The action's return value, when it returned one. */
  value?: { ok?: boolean; message?: string; fieldErrors?: Record<string, string[]> } | null;
  text: string;
}

/**
 * The rows of a React flight response: `<hex id>:<json>\n`, or `<hex id>:T<hex byte length>,<text>`
 * (a long string, sent by length, newline-free framing).
 */
function flightRows(bytes: Buffer): Map<string, string> {
  const rows = new Map<string, string>();
  let i = 0;
  while (i < bytes.length) {
    const colon = bytes.indexOf(0x3a, i);
    if (colon < 0) break;
    const id = bytes.subarray(i, colon).toString();
    if (bytes[colon + 1] === 0x54 /* T */) {
      const comma = bytes.indexOf(0x2c, colon);
      const len = parseInt(bytes.subarray(colon + 2, comma).toString(), 16);
      rows.set(id, JSON.stringify(bytes.subarray(comma + 1, comma + 1 + len).toString()));
      i = comma + 1 + len;
    } else {
      let nl = bytes.indexOf(0x0a, colon);
      if (nl < 0) nl = bytes.length;
      rows.set(id, bytes.subarray(colon + 1, nl).toString());
      i = nl + 1;
    }
  }
  return rows;
}

/** The action's return value out of the flight response: the row the root's `a` points at. */
function parseFlight(bytes: Buffer): ActionAnswer["value"] {
  const rows = flightRows(bytes);
  const root = rows.get("0");
  if (!root) return undefined;
  try {
    const r = JSON.parse(root) as { a?: unknown };
    if (typeof r.a === "string" && r.a.startsWith("$@")) {
      const row = rows.get(r.a.slice(2));
      return row === undefined ? undefined : (JSON.parse(row) as ActionAnswer["value"]);
    }
    return r.a as ActionAnswer["value"];
  } catch {
    return undefined;
  }
}

export async function callAction(
  baseUrl: string,
  name: string,
  args: unknown[],
  opts: { cookie?: string; path: string },
): Promise<ActionAnswer> {
  const { id } = actionRef(name);
  const body = await encodeReply(args);
  const res = await fetch(`${baseUrl}${opts.path}`, {
    method: "POST",
    redirect: "manual",
    headers: {
      accept: "text/x-component",
      "next-action": id,
      origin: baseUrl,
      ...(typeof body === "string" ? { "content-type": "text/plain;charset=UTF-8" } : {}),
      ...(opts.cookie ? { cookie: opts.cookie } : {}),
    },
    body,
  });
  const bytes = Buffer.from(await res.arrayBuffer());
  const text = bytes.toString();
  const redirect =
    res.headers.get("x-action-redirect")?.split(";")[0] ?? res.headers.get("location") ?? undefined;
  return { status: res.status, redirect, value: parseFlight(bytes), text };
}
