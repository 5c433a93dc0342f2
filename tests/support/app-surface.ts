/**
 * The app's surface read from the code, so a test table keyed by it notices a new entry:
 * every page (`app/**\/page.tsx`) and route handler (`app/**\/route.ts`, with the HTTP methods it
 * exports) as a URL pattern without route groups, e.g. `/jobs/[id]`, and every server action
 * (each exported function of a file whose first statement is "use server"), named
 * `<file>#<export>`, e.g. `components/jobs/actions.ts#payForJob`.
 */
import { readdirSync, readFileSync, statSync } from "node:fs";
import { join, relative, sep } from "node:path";

const ROOT = process.cwd();
const METHODS = ["GET", "POST", "PUT", "PATCH", "DELETE", "HEAD", "OPTIONS"] as const;
export type Method = (typeof METHODS)[number];

function walk(dir: string, out: string[] = []): string[] {
  for (const name of readdirSync(dir)) {
    if (name === "node_modules" || name.startsWith(".")) continue;
    const p = join(dir, name);
    if (statSync(p).isDirectory()) walk(p, out);
    else out.push(p);
  }
  return out;
}

const rel = (p: string) => relative(ROOT, p).split(sep).join("/");

/** `app/(app)/jobs/[id]/page.tsx` → `/jobs/[id]`. */
export function patternOf(file: string): string {
  const parts = rel(file).split("/").slice(1, -1);
  const kept = parts.filter((p) => !(p.startsWith("(") && p.endsWith(")")) && !p.startsWith("@"));
  return `/${kept.join("/")}`;
}

export interface PageEntry {
  pattern: string;
  file: string;
}
export interface RouteEntry {
  pattern: string;
  file: string;
  methods: Method[];
}
export interface ActionEntry {
  /** `<file>#<export>` */
  name: string;
  file: string;
  exportName: string;
}

export function listPages(): PageEntry[] {
  return walk(join(ROOT, "app"))
    .filter((f) => /\/page\.(tsx|ts|jsx|js)$/.test(f))
    .map((f) => ({ pattern: patternOf(f), file: rel(f) }))
    .sort((a, b) => a.pattern.localeCompare(b.pattern));
}

/** The methods a route file exports, whichever way it spells the export. */
export function exportedMethods(source: string): Method[] {
  const found = new Set<Method>();
  for (const m of source.matchAll(/export\s+(?:async\s+)?(?:function|const|let)\s+(\w+)/g))
    if ((METHODS as readonly string[]).includes(m[1]!)) found.add(m[1] as Method);
  // export { handler as GET, POST } / export const { GET, POST } = …
  for (const m of source.matchAll(/export\s+(?:const\s+)?\{([^}]*)\}/g))
    for (const part of m[1]!.split(",")) {
      const name = part
        .trim()
        .split(/\s+as\s+/)
        .pop()!
        .trim();
      if ((METHODS as readonly string[]).includes(name)) found.add(name as Method);
    }
  return METHODS.filter((m) => found.has(m));
}

export function listRoutes(): RouteEntry[] {
  return walk(join(ROOT, "app"))
    .filter((f) => /\/route\.(ts|js)$/.test(f))
    .map((f) => ({
      pattern: patternOf(f),
      file: rel(f),
      methods: exportedMethods(readFileSync(f, "utf8")),
    }))
    .sort((a, b) => a.pattern.localeCompare(b.pattern));
}

const USE_SERVER = /^(?:\s|\/\/[^\n]*\n|\/\*[\s\S]*?\*\/)*["']use server["']/;

/** Every exported function of every "use server" file under app/, components/ and lib/. */
export function listActions(): ActionEntry[] {
  const files = ["app", "components", "lib"]
    .flatMap((d) => walk(join(ROOT, d)))
    .filter((f) => /\.(ts|tsx)$/.test(f));
  const out: ActionEntry[] = [];
  for (const f of files) {
    const src = readFileSync(f, "utf8");
    if (!USE_SERVER.test(src)) continue;
    const names = new Set<string>();
    for (const m of src.matchAll(/export\s+(?:async\s+)?function\s+(\w+)/g)) names.add(m[1]!);
    for (const m of src.matchAll(/export\s+const\s+(\w+)\s*=\s*(?:async\b|\()/g)) names.add(m[1]!);
    for (const exportName of names)
      out.push({ name: `${rel(f)}#${exportName}`, file: rel(f), exportName });
  }
  return out.sort((a, b) => a.name.localeCompare(b.name));
}

/** Files that declare "use server" inside a function (inline actions): the table cannot key them. */
export function inlineActionFiles(): string[] {
  return ["app", "components"]
    .flatMap((d) => walk(join(ROOT, d)))
    .filter((f) => /\.(ts|tsx)$/.test(f))
    .filter((f) => {
      const src = readFileSync(f, "utf8");
      return !USE_SERVER.test(src) && /\{\s*["']use server["']/.test(src);
    })
    .map(rel);
}
