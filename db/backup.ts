/**
 * `npm run backup [-- <folder>]`: one dated archive of the app database and the upload store.
 *
 *   backups/loopwright-<db>-<yyyymmdd-hhmmss>.tar.gz
 *     database.sql    mariadb-dump --single-transaction (one consistent snapshot, no locks)
 *     uploads/        the upload store's files (UPLOAD_STORE_DIR, default .data/uploads)
 *     manifest.json   when, which database, rows per table, every file's size and SHA-256
 *
 * DB_TARGET=test backs up the test database. `npm run restore -- <archive>` puts it back.
 * Uses Debian's mariadb-dump and tar (installed with mariadb-server and the base system).
 */
import { spawn } from "node:child_process";
import { createHash } from "node:crypto";
import {
  createReadStream,
  createWriteStream,
  cpSync,
  existsSync,
  mkdirSync,
  mkdtempSync,
  readdirSync,
  readFileSync,
  rmSync,
  statSync,
  writeFileSync,
} from "node:fs";
import { tmpdir } from "node:os";
import { join, relative, resolve } from "node:path";
import knexFactory from "knex";
import { knexConfig } from "../knexfile";

export interface Manifest {
  createdAt: string;
  database: string;
  tables: Record<string, number>;
  files: Record<string, { size: number; sha256: string }>;
}

export const uploadStoreDir = () =>
  resolve(process.env.UPLOAD_STORE_DIR ?? join(process.cwd(), ".data", "uploads"));

/** Run a program; its stdout to a file when given; reject with its stderr on failure. */
export function run(
  cmd: string,
  args: string[],
  o: { env?: Record<string, string>; stdoutTo?: string; stdin?: string } = {},
): Promise<void> {
  return new Promise((ok, fail) => {
    const child = spawn(cmd, args, {
      env: { ...process.env, ...o.env },
      stdio: [o.stdin ? "pipe" : "ignore", o.stdoutTo ? "pipe" : "inherit", "pipe"],
    });
    let err = "";
    child.stderr!.on("data", (d: Buffer) => (err += d.toString()));
    if (o.stdoutTo) child.stdout!.pipe(createWriteStream(o.stdoutTo));
    if (o.stdin) createReadStream(o.stdin).pipe(child.stdin!);
    child.on("error", fail);
    child.on("close", (code) =>
      code === 0 ? ok() : fail(new Error(`${cmd} exited with ${code}: ${err.trim()}`)),
    );
  });
}

export function connectionArgs() {
  const c = knexConfig().connection as {
    host: string;
    port: number;
    user: string;
    password: string;
    database: string;
  };
  return {
    database: c.database,
    args: ["--no-defaults", "--protocol=tcp", `-h${c.host}`, `-P${c.port}`, `-u${c.user}`],
    // The password goes by environment, never on the command line (ps would show it).
    env: { MYSQL_PWD: c.password },
  };
}

export function listFiles(dir: string): Manifest["files"] {
  const out: Manifest["files"] = {};
  if (!existsSync(dir)) return out;
  const walk = (d: string) => {
    for (const name of readdirSync(d)) {
      const p = join(d, name);
      if (statSync(p).isDirectory()) walk(p);
      else {
        const bytes = readFileSync(p);
        out[relative(dir, p)] = {
          size: bytes.length,
          sha256: createHash("sha256").update(bytes).digest("hex"),
        };
      }
    }
  };
  walk(dir);
  return out;
}

export async function rowCounts(): Promise<Record<string, number>> {
  const knex = knexFactory(knexConfig());
  try {
    const tables = ((await knex.raw("SHOW TABLES"))[0] as Record<string, string>[]).map(
      (r) => Object.values(r)[0]!,
    );
    const out: Record<string, number> = {};
    for (const t of tables) out[t] = Number((await knex(t).count({ n: "*" }))[0]!.n);
    return out;
  } finally {
    await knex.destroy();
  }
}

export async function backup(outDir: string): Promise<{ archive: string; bytes: number }> {
  const { database, args, env } = connectionArgs();
  const stage = mkdtempSync(join(tmpdir(), "loopwright-backup-"));
  try {
    // The counts are read before the dump; writes in between show up in the dump only, which is
    // why restore checks "at least" the manifest's counts when the app was running.
    const tables = await rowCounts();
    await run(
      "mariadb-dump",
      [
        ...args,
        "--single-transaction",
        "--quick",
        "--routines",
        "--triggers",
        "--hex-blob",
        "--default-character-set=utf8mb4",
        database,
      ],
      { env, stdoutTo: join(stage, "database.sql") },
    );
    const store = uploadStoreDir();
    mkdirSync(join(stage, "uploads"));
    if (existsSync(store)) cpSync(store, join(stage, "uploads"), { recursive: true });
    const manifest: Manifest = {
      createdAt: new Date().toISOString(),
      database,
      tables,
      files: listFiles(join(stage, "uploads")),
    };
    writeFileSync(join(stage, "manifest.json"), JSON.stringify(manifest, null, 2));
    mkdirSync(outDir, { recursive: true });
    const stamp = manifest.createdAt.replace(/[-:]/g, "").replace("T", "-").slice(0, 15);
    const archive = resolve(outDir, `loopwright-${database}-${stamp}.tar.gz`);
    await run("tar", ["-czf", archive, "-C", stage, "manifest.json", "database.sql", "uploads"]);
    return { archive, bytes: statSync(archive).size };
  } finally {
    rmSync(stage, { recursive: true, force: true });
  }
}

if (process.argv[1] && resolve(process.argv[1]) === resolve(import.meta.filename)) {
  const started = Date.now();
  backup(process.argv[2] ?? join(process.cwd(), "backups"))
    .then(({ archive, bytes }) => {
      console.log(
        `[backup] ${archive} (${(bytes / 1024).toFixed(1)} KiB) in ${Date.now() - started} ms`,
      );
    })
    .catch((e: Error) => {
      console.error(`[backup] failed: ${e.message}`);
      process.exit(1);
    });
}
