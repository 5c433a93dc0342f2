/**
 * The access matrix against the built app: every page, route handler method and server action
 * the code has (read from the file tree and the "use server" files' exports) × eight actors, each
 * with a real next-auth session, answered as the table in access-matrix.table.ts says. A refused
 * action must also leave every table's checksum as it was.
 */
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Knex } from "knex";
import { testKnex, truncateAll } from "../support/db";
import { listActions, listPages, listRoutes } from "../support/app-surface";
import {
  ACTORS,
  ACTOR_WORDS,
  buildWorld,
  changedTables,
  fillPattern,
  tableChecksums,
  type Actor,
  type World,
} from "../support/access-world";
import { builtActionNames, callAction } from "../support/actions-http";
import {
  ACTIONS,
  PAGES,
  ROUTES,
  type ActionOutcome,
  type PageOutcome,
} from "./access-matrix.table";

const baseUrl = inject("baseUrl");
const UPLOAD_DIR = ".data/uploads-test";

const pages = listPages();
const routes = listRoutes();
const actions = listActions();

describe("access matrix: every page, route and action × every actor", () => {
  let knex: Knex;
  let w: World;
  const tally = { pages: 0, routes: 0, actions: 0 };

  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
    w = await buildWorld(knex, baseUrl, UPLOAD_DIR, inject("paymentsUrl"));
  });
  afterAll(async () => {
    console.log(
      `access matrix: ${tally.pages} page, ${tally.routes} route and ${tally.actions} action calls ` +
        `(${pages.length} pages, ${routes.reduce((n, r) => n + r.methods.length, 0)} route methods, ` +
        `${actions.length} actions × ${ACTORS.length} actors)`,
    );
    await truncateAll(knex);
    await knex.destroy();
  });

  it("has a row for every page, route method and server action in the code, and none for what is gone", () => {
    const missing: string[] = [];
    for (const p of pages) if (!PAGES[p.pattern]) missing.push(`page ${p.pattern} (${p.file})`);
    for (const r of routes)
      for (const m of r.methods)
        if (!ROUTES[r.pattern]?.[m]) missing.push(`route ${m} ${r.pattern} (${r.file})`);
    for (const a of actions) if (!ACTIONS[a.name]) missing.push(`action ${a.name}`);
    expect(missing, "add a row to tests/e2e/access-matrix.table.ts for each").toEqual([]);

    const stale: string[] = [];
    for (const k of Object.keys(PAGES)) if (!pages.some((p) => p.pattern === k)) stale.push(k);
    for (const [k, row] of Object.entries(ROUTES)) {
      const r = routes.find((x) => x.pattern === k);
      for (const m of Object.keys(row).filter((x) => x !== "note"))
        if (!r?.methods.includes(m as never)) stale.push(`${m} ${k}`);
    }
    for (const k of Object.keys(ACTIONS)) if (!actions.some((a) => a.name === k)) stale.push(k);
    expect(stale, "rows for things the code no longer has").toEqual([]);
    // The build knows every action the code declares (a stale build would test old code).
    expect(actions.map((a) => a.name).filter((n) => !builtActionNames().includes(n))).toEqual([]);
  });

  const get = (path: string, actor: Actor) =>
    fetch(`${baseUrl}${path}`, {
      redirect: "manual",
      headers: w.cookies[actor] ? { cookie: w.cookies[actor]! } : {},
    });

  async function pageOutcome(res: Response): Promise<string> {
    if ([302, 303, 307, 308].includes(res.status)) {
      const to = res.headers.get("location") ?? "";
      return new URL(to, baseUrl).pathname === "/sign-in" ? "signin" : `redirect ${to}`;
    }
    return String(res.status);
  }

  for (const p of pages) {
    const row = PAGES[p.pattern];
    if (!row) continue;
    it(`page ${p.pattern}`, async () => {
      const wrong: string[] = [];
      for (const actor of ACTORS) {
        const want: PageOutcome = row.expect[actor];
        const res = await get(fillPattern(p.pattern, row.params, w), actor);
        tally.pages++;
        const got = await pageOutcome(res);
        const body = got === "200" ? await res.text() : "";
        if (typeof want === "object") {
          if (got !== "200" || !body.includes(want.shows))
            wrong.push(`${ACTOR_WORDS[actor]}: wanted 200 showing "${want.shows}", got ${got}`);
        } else if (got !== String(want)) {
          wrong.push(`${ACTOR_WORDS[actor]}: wanted ${want}, got ${got}`);
        }
      }
      expect(wrong).toEqual([]);
    });
  }

  for (const r of routes) {
    for (const method of r.methods) {
      const c = ROUTES[r.pattern]?.[method];
      if (!c || c === "not-matrixed") continue;
      it(`route ${method} ${r.pattern}`, async () => {
        const wrong: string[] = [];
        for (const actor of ACTORS) {
          const suffix = typeof c.suffix === "function" ? c.suffix(w, actor) : (c.suffix ?? "");
          const path = fillPattern(r.pattern, c.params, w) + suffix;
          const res = await fetch(`${baseUrl}${path}`, {
            method,
            redirect: "manual",
            headers: {
              ...(w.cookies[actor] ? { cookie: w.cookies[actor]! } : {}),
              ...(c.body !== undefined ? { "content-type": "application/json" } : {}),
            },
            body: c.body !== undefined ? JSON.stringify(c.body) : undefined,
          });
          tally.routes++;
          const text = await res.text();
          if (res.status !== c.expect[actor])
            wrong.push(`${ACTOR_WORDS[actor]}: wanted ${c.expect[actor]}, got ${res.status}`);
          // A refusal as JSON says why in words.
          if (res.status >= 400 && (res.headers.get("content-type") ?? "").includes("json"))
            if (!/"(error|message)":"[^"]{3,}/.test(text))
              wrong.push(
                `${ACTOR_WORDS[actor]}: ${res.status} without a message: ${text.slice(0, 80)}`,
              );
        }
        expect(wrong).toEqual([]);
      });
    }
  }

  for (const a of actions) {
    const row = ACTIONS[a.name];
    if (!row) continue;
    it(`action ${a.name}`, async () => {
      const wrong: string[] = [];
      // Refusals first, then the actors who may: a success never hides a later refusal.
      const order = [...ACTORS].sort(
        (x, y) => Number(row.expect[x] === "ok") - Number(row.expect[y] === "ok"),
      );
      for (const actor of order) {
        const want: ActionOutcome = row.expect[actor];
        const args = await row.args({ knex, w, actor });
        const before = want === "ok" ? undefined : await tableChecksums(knex);
        // A signed-out caller of an app page's action is sent to sign-in by proxy.ts before the
        // action runs (and by runAction's own check behind it); public pages' actions run.
        const path = fillPattern(row.page, row.params, w);
        const ans = await callAction(baseUrl, a.name, args, { cookie: w.cookies[actor], path });
        tally.actions++;
        const got =
          ans.status >= 500
            ? `error ${ans.status}`
            : ans.redirect && new URL(ans.redirect, baseUrl).pathname === "/sign-in"
              ? "signin"
              : ans.value?.ok === true || (ans.redirect && ans.value === undefined)
                ? "ok"
                : ans.value?.ok === false && (ans.value.message ?? "").length > 3
                  ? "refused"
                  : `unclear (${ans.status} ${ans.text.slice(0, 120)})`;
        if (got !== want)
          wrong.push(
            `${ACTOR_WORDS[actor]}: wanted ${want}, got ${got}${ans.value?.message ? ` "${ans.value.message}"` : ""}`,
          );
        if (before) {
          const changed = changedTables(before, await tableChecksums(knex));
          if (changed.length) wrong.push(`${ACTOR_WORDS[actor]}: changed ${changed.join(", ")}`);
        }
      }
      expect(wrong).toEqual([]);
    });
  }
});
