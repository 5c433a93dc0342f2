/**
 * `npm run restore -- <archive>`: put back a `npm run backup` archive. It REPLACES the app
 * database's tables (the dump drops and recreates each one) and the upload store's files, then
 * checks that every table has at least the rows the manifest counted and that every file is back
 * with the same SHA-256. DB_TARGET=test restores into the test database. Stop the app and the
 * worker first.
 */
import { existsSync, mkdtempSync, readFileSync, rmSync, cpSync, mkdirSync } from "node:fs";
import { tmpdir } from "node:os";
import { join, resolve } from "node:path";
import { connectionArgs, listFiles, rowCounts, run, uploadStoreDir, type Manifest } from "./backup";

export async function restore(archive: string): Promise<{ tables: number; files: number }> {
  if (!existsSync(archive)) throw new Error(`no such archive: ${archive}`);
  const stage = mkdtempSync(join(tmpdir(), "loopwright-restore-"));
  try {
    await run("tar", ["-xzf", resolve(archive), "-C", stage]);
    const manifest = JSON.parse(readFileSync(join(stage, "manifest.json"), "utf8")) as Manifest;
    const { database, args, env } = connectionArgs();
    await run("mariadb", [...args, "--default-character-set=utf8mb4", database], {
      env,
      stdin: join(stage, "database.sql"),
    });
    const store = uploadStoreDir();
    rmSync(store, { recursive: true, force: true });
    mkdirSync(store, { recursive: true });
    cpSync(join(stage, "uploads"), store, { recursive: true });

    const problems: string[] = [];
    const counts = await rowCounts();
    for (const [t, n] of Object.entries(manifest.tables))
      if ((counts[t] ?? -1) < n)
        problems.push(`table ${t}: ${counts[t] ?? "missing"} rows, the backup counted ${n}`);
    const files = listFiles(store);
    for (const [f, meta] of Object.entries(manifest.files))
      if (files[f]?.sha256 !== meta.sha256) problems.push(`file ${f} is missing or differs`);
    if (problems.length) throw new Error(`restored, but:\n  ${problems.join("\n  ")}`);
    return { tables: Object.keys(manifest.tables).length, files: Object.keys(files).length };
  } finally {
    rmSync(stage, { recursive: true, force: true });
  }
}

if (process.argv[1] && resolve(process.argv[1]) === resolve(import.meta.filename)) {
  const archive = process.argv[2];
  if (!archive) {
    console.error("usage: npm run restore -- backups/loopwright-<db>-<stamp>.tar.gz");
    process.exit(2);
  }
  const started = Date.now();
  restore(archive)
    .then(({ tables, files }) =>
      console.log(
        `[restore] ${tables} tables and ${files} files back from ${archive} in ${Date.now() - started} ms`,
      ),
    )
    .catch((e: Error) => {
      console.error(`[restore] failed: ${e.message}`);
      process.exit(1);
    });
}
