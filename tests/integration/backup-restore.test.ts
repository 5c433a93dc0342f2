/**
 * `npm run backup` and `npm run restore` as commands, on the test database and a private upload
 * store: back up, wipe both, restore, and find every row (table checksums) and every file (bytes)
 * again. Also the durability settings of the server the tests run on.
 */
import { execFile } from "node:child_process";
import { mkdtempSync, readdirSync, readFileSync, rmSync, statSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { promisify } from "node:util";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import type { Knex } from "knex";
import { testKnex, truncateAll } from "../support/db";
import { makeJob, makeProject, makeReviewer, makeHomeowner } from "../support/fixtures";
import { storeFile, tableChecksums } from "../support/access-world";

const exec = promisify(execFile);

describe("backup and restore", () => {
  let knex: Knex;
  const work = mkdtempSync(join(tmpdir(), "loopwright-backup-test-"));
  const store = join(work, "uploads");
  const out = join(work, "backups");
  const env = {
    ...process.env,
    DB_TARGET: "test",
    UPLOAD_STORE_DIR: store,
  };

  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
  });
  afterAll(async () => {
    await truncateAll(knex);
    await knex.destroy();
    rmSync(work, { recursive: true, force: true });
  });

  it("keeps every committed transaction through a crash: InnoDB flushes its log at each commit", async () => {
    const [[v]] = (await knex.raw(
      "SELECT @@innodb_flush_log_at_trx_commit AS flush, @@log_bin AS binlog, @@sync_binlog AS sync_binlog",
    )) as [{ flush: number; binlog: number; sync_binlog: number }[]];
    expect(Number(v!.flush)).toBe(1);
    // With the binary log on, it must be synced at each commit too.
    if (Number(v!.binlog) === 1) expect(Number(v!.sync_binlog)).toBe(1);
  });

  it("backs up, wipes, restores, and finds every row and every file again", async () => {
    const owner = await makeHomeowner(knex, { displayName: "Zoë O’Brien – 屋根" });
    const reviewer = await makeReviewer(knex);
    const job = await makeJob(knex, "delivered", { homeowner: owner, reviewer });
    const other = await makeProject(knex, owner);
    for (let i = 0; i < 3; i++) await storeFile(knex, i ? other : job.project, store);
    const rowsBefore = await tableChecksums(knex);
    const filesBefore = Object.fromEntries(
      readdirSync(store).map((f) => [f, readFileSync(join(store, f)).toString("base64")]),
    );

    const started = Date.now();
    const b = await exec("npx", ["tsx", "db/backup.ts", out], { env });
    const backupMs = Date.now() - started;
    const archives = readdirSync(out);
    expect(archives).toHaveLength(1);
    expect(archives[0]).toMatch(/^loopwright-.+-\d{8}-\d{6}\.tar\.gz$/);
    expect(b.stdout).toMatch(/\[backup\]/);
    const archive = join(out, archives[0]!);

    // Wipe: every row and every file, and one table dropped outright.
    await truncateAll(knex);
    await knex.raw("SET FOREIGN_KEY_CHECKS = 0");
    await knex.schema.dropTable("messages");
    await knex.raw("SET FOREIGN_KEY_CHECKS = 1");
    rmSync(store, { recursive: true, force: true });
    expect(await knex("users").count({ n: "*" })).toEqual([{ n: 0 }]);

    const t0 = Date.now();
    const r = await exec("npx", ["tsx", "db/restore.ts", archive], { env });
    const restoreMs = Date.now() - t0;
    expect(r.stdout).toMatch(/\[restore\] \d+ tables and 6 files back/);

    expect(await tableChecksums(knex)).toEqual(rowsBefore);
    const filesAfter = Object.fromEntries(
      readdirSync(store).map((f) => [f, readFileSync(join(store, f)).toString("base64")]),
    );
    expect(filesAfter).toEqual(filesBefore);
    const name = await knex("users").where({ id: owner.id }).first("display_name");
    expect(name.display_name).toBe("Zoë O’Brien – 屋根");
    console.log(
      `backup: ${statSync(archive).size} bytes in ${backupMs} ms; restore in ${restoreMs} ms (both include tsx start-up)`,
    );
  });

  it("refuses an archive that is not there, and changes nothing", async () => {
    const before = await tableChecksums(knex);
    await expect(
      exec("npx", ["tsx", "db/restore.ts", join(work, "nope.tar.gz")], { env }),
    ).rejects.toMatchObject({ stderr: expect.stringMatching(/no such archive/) });
    expect(await tableChecksums(knex)).toEqual(before);
  });
});
