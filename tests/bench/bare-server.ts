/**
 * The bare limit for `npm run bench`: a minimal Node `http` server with a `mysql2` pool that, per
 * request, runs the same two SQL statements the board route runs (the reviewer's verified state
 * and centre, then the board page with the project level joined) and answers the same JSON. No
 * framework, no session, no query builder: what the machine and MariaDB can do for this page.
 *
 *   node --import tsx tests/bench/bare-server.ts <port> <spec.json>
 * spec.json: { connection, reviewer: { sql, bindings }, board: { sql, bindings }, sort, limit }
 */
import { createServer } from "node:http";
import { readFileSync } from "node:fs";
import mysql from "mysql2/promise";
import { toBoardPage } from "@/lib/data/board";
import type { BoardQuery } from "@/lib/validation/board";

interface Statement {
  sql: string;
  bindings: unknown[];
}
interface Spec {
  connection: mysql.PoolOptions;
  reviewer: Statement;
  board: Statement;
  sort: BoardQuery["sort"];
  limit: number;
}

const [port, specPath] = process.argv.slice(2) as [string, string];
const spec = JSON.parse(readFileSync(specPath, "utf8")) as Spec;
const pool = mysql.createPool({ ...spec.connection, connectionLimit: 10 });

const server = createServer((req, res) => {
  void (async () => {
    try {
      const [reviewer] = await pool.query(spec.reviewer.sql, spec.reviewer.bindings);
      if (!(reviewer as unknown[]).length) throw new Error("no reviewer");
      const [rows] = await pool.query(spec.board.sql, spec.board.bindings);
      const body = JSON.stringify(toBoardPage(rows as never, spec.sort, spec.limit));
      res.writeHead(200, {
        "content-type": "application/json",
        "cache-control": "private, no-store",
      });
      res.end(body);
    } catch (err) {
      res.writeHead(500, { "content-type": "application/json" });
      res.end(JSON.stringify({ message: String(err) }));
    }
  })();
});
server.listen(Number(port), "127.0.0.1", () => console.log(`[bare] listening on ${port}`));
const stop = () => {
  server.close();
  void pool.end().then(() => process.exit(0));
};
process.on("SIGTERM", stop);
process.on("SIGINT", stop);
