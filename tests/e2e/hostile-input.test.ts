/**
 * Hostile input against the built app: fast-check payloads to every JSON route and every server
 * action, sent with a session that may use them. Each answer is a refusal with a message in
 * words (4xx for JSON, `{ ok: false, message }` for actions) — never a 5xx nor the "something
 * went wrong" of an unexpected error — and a refusal changes no row (every table's checksum).
 * Seed and runs: HOSTILE_SEED, HOSTILE_RUNS (tests/support/hostile.ts).
 */
import fc from "fast-check";
import { afterAll, beforeAll, describe, expect, inject, it } from "vitest";
import type { Knex } from "knex";
import { testKnex, truncateAll } from "../support/db";
import { listActions } from "../support/app-surface";
import {
  ACTORS,
  buildWorld,
  changedTables,
  fillPattern,
  tableChecksums,
  type Actor,
  type World,
} from "../support/access-world";
import { callAction } from "../support/actions-http";
import {
  deepNesting,
  fcOptions,
  HOSTILE_RUNS,
  HOSTILE_SEED,
  hostileFormFields,
  hostileString,
  hostileValue,
  mutated,
} from "../support/hostile";
import { form } from "../support/actions-http";
import { ACTIONS } from "./access-matrix.table";

const baseUrl = inject("baseUrl");
const GENERIC_FAILURE = /something went wrong/i;

/** Actions that take no input worth refusing: any payload is (rightly) accepted. */
const ACCEPTS_ANYTHING = new Set([
  "components/auth/actions.ts#requestReset", // same answer for every address, by design
  "components/auth/actions.ts#confirmEmail", // a bad token lands on the "did not work" page
  "components/auth/actions.ts#resendConfirmation",
  "components/settings/actions.ts#saveNotificationSettings",
  "components/jobs/actions.ts#setUpPayoutAccount",
]);

const jsonText = (v: unknown) =>
  JSON.stringify(v, (_k, x: unknown) => (typeof x === "bigint" ? x.toString() : x)) ?? "null";

describe(`hostile input (seed ${HOSTILE_SEED}, ${HOSTILE_RUNS} runs per target)`, () => {
  let knex: Knex;
  let w: World;
  let tried = 0;

  beforeAll(async () => {
    knex = testKnex();
    await truncateAll(knex);
    w = await buildWorld(knex, baseUrl, ".data/uploads-test", inject("paymentsUrl"));
  });
  afterAll(async () => {
    console.log(`hostile input: ${tried} payloads, seed ${HOSTILE_SEED}`);
    await truncateAll(knex);
    await knex.destroy();
  });

  async function send(
    method: string,
    path: string,
    actor: Actor,
    body?: string,
  ): Promise<{ status: number; text: string; type: string }> {
    const res = await fetch(`${baseUrl}${path}`, {
      method,
      redirect: "manual",
      headers: {
        ...(w.cookies[actor] ? { cookie: w.cookies[actor]! } : {}),
        ...(body !== undefined ? { "content-type": "application/json" } : {}),
      },
      body,
    });
    tried++;
    return {
      status: res.status,
      text: await res.text(),
      type: res.headers.get("content-type") ?? "",
    };
  }

  /** A 4xx JSON refusal with words in it, and nothing changed. */
  async function expectRefusal(
    call: () => Promise<{ status: number; text: string; type: string }>,
    allowed: number[] = [400, 404, 413, 415, 422],
  ) {
    const before = await tableChecksums(knex);
    const r = await call();
    expect(r.status, r.text.slice(0, 200)).toBeLessThan(500);
    // A URL over Node's 16 KB header limit is refused by the HTTP server itself, before the app.
    if (r.status === 431) return;
    expect(allowed, `status ${r.status}: ${r.text.slice(0, 200)}`).toContain(r.status);
    expect(r.type).toContain("json");
    expect(r.text).toMatch(/"error":"[^"]{5,}/);
    expect(r.text).not.toMatch(GENERIC_FAILURE);
    expect(changedTables(before, await tableChecksums(knex))).toEqual([]);
  }

  it("POST /api/requests/[id]/messages: a broken message body is refused, nothing saved", async () => {
    const path = `/api/requests/${w.openRequest.id}/messages`;
    const badBody = fc.oneof(
      // not an object
      hostileValue.filter((v) => v === null || typeof v !== "object").map(jsonText),
      // the body field of the wrong type, empty, blank or too long
      fc
        .oneof(
          hostileValue.filter((v) => typeof v !== "string"),
          fc.constantFrom("", "   ", "\n\t"),
          fc.integer({ min: 4_001, max: 200_000 }).map((n) => "x".repeat(n)),
        )
        .map((body) => jsonText({ body })),
      deepNesting.map((v) => jsonText({ body: v })),
      // not JSON at all
      fc.constantFrom("{", '{"body": NaN}', "body=hi", "\u0000", '{"body":"a"'.repeat(3)),
    );
    await fc.assert(
      fc.asyncProperty(badBody, async (body) => {
        await expectRefusal(() => send("POST", path, "jobReviewer", body));
      }),
      fcOptions(),
    );
  });

  it("the request and reviewer ids in the message route's URL: refused in words", async () => {
    await fc.assert(
      fc.asyncProperty(hostileString, hostileString, async (id, reviewer) => {
        const path = `/api/requests/${encodeURIComponent(id) || "x"}/messages?reviewer=${encodeURIComponent(reviewer)}`;
        const r = await send("GET", path, "owner");
        expect(r.status, r.text.slice(0, 200)).toBeLessThan(500);
        // 431: a URL over Node's 16 KB header limit is refused by the HTTP server itself.
        if (r.status !== 200 && r.status !== 431) expect(r.text).toMatch(/"error":"[^"]{5,}/);
      }),
      fcOptions(),
    );
  });

  it("GET /api/board with hostile filters: 200 or a 400 naming the filter, never 5xx", async () => {
    const query = fc.dictionary(
      fc.constantFrom(
        "region",
        "kind",
        "collectorType",
        "minBudget",
        "maxBudget",
        "page",
        "sort",
        "near",
        "radiusKm",
        "cursor",
        "x",
      ),
      hostileString,
      { maxKeys: 4 },
    );
    await fc.assert(
      fc.asyncProperty(query, async (q) => {
        const qs = new URLSearchParams(q as Record<string, string>).toString();
        const r = await send("GET", `/api/board?${qs}`, "verifiedReviewer");
        expect(r.status, r.text.slice(0, 200)).toBeLessThan(500);
        expect([200, 400, 431]).toContain(r.status);
        if (r.status === 400) expect(r.text).toMatch(/"error":"[^"]{5,}/);
      }),
      fcOptions(),
    );
  });

  it("GET /api/files/[id] and /api/credentials/[id] with hostile ids: 400 or 404 in words", async () => {
    await fc.assert(
      fc.asyncProperty(
        fc.oneof(
          hostileString,
          fc.constantFrom("-1", "0", "1.5", "1e3", "99999999999999999999", "0x10"),
        ),
        fc.constantFrom("files", "credentials"),
        async (id, what) => {
          await expectRefusal(
            () => send("GET", `/api/${what}/${encodeURIComponent(id) || "%20"}`, "admin"),
            [400, 404],
          );
        },
      ),
      fcOptions(),
    );
  });

  it("POST /api/webhooks/payments: unsigned or badly signed events are refused, nothing recorded", async () => {
    await fc.assert(
      fc.asyncProperty(hostileValue, fc.option(hostileString), async (event, signature) => {
        const before = await tableChecksums(knex);
        const res = await fetch(`${baseUrl}/api/webhooks/payments`, {
          method: "POST",
          headers: {
            "content-type": "application/json",
            ...(signature !== null && !/[^\t\x20-\x7e]/.test(signature)
              ? { "stripe-signature": signature.slice(0, 2000) }
              : {}),
          },
          body: jsonText(event),
        });
        tried++;
        const text = await res.text();
        expect(res.status, text.slice(0, 200)).toBe(400);
        expect(text).toMatch(/"error":"[^"]{5,}/);
        expect(changedTables(before, await tableChecksums(knex))).toEqual([]);
      }),
      fcOptions(),
    );
  });

  for (const a of listActions()) {
    const row = ACTIONS[a.name];
    if (!row) continue;
    // Someone the action is for (or the nearest to it), so the input is what gets checked.
    const actor: Actor =
      ACTORS.find((x) => row.expect[x] === "ok") ??
      (row.page.startsWith("/admin") ? "admin" : "owner");

    it(`action ${a.name} as ${actor}: hostile arguments are refused in words, nothing changed`, async () => {
      const valid = await row.args({ knex, w, actor });
      // A valid argument list with its form fields (or object fields) broken, or any list at all.
      const formIndex = valid.findIndex((v) => v instanceof FormData);
      const fields: Record<string, string> = {};
      if (formIndex >= 0)
        for (const [k, v] of (valid[formIndex] as FormData).entries())
          if (typeof v === "string") fields[k] = v;
      const argsArb = fc.oneof(
        fc.array(hostileValue, { maxLength: 5 }),
        hostileFormFields.map((f) =>
          valid.map((v, i) => (i === formIndex ? form(f as Record<string, string>) : v)),
        ),
        fc
          .tuple(fc.nat({ max: Math.max(0, valid.length - 1) }), hostileValue)
          .map(([i, h]) => valid.map((v, j) => (j === i ? h : v))),
        mutated(fields).map(({ value }) =>
          valid.map((v, i) =>
            i === formIndex
              ? form(
                  Object.fromEntries(
                    Object.entries(value).map(([k, x]) => [
                      k,
                      typeof x === "string" ? x : jsonText(x),
                    ]),
                  ),
                )
              : v,
          ),
        ),
      );
      await fc.assert(
        fc.asyncProperty(argsArb, async (args) => {
          const before = await tableChecksums(knex);
          const ans = await callAction(baseUrl, a.name, args, {
            cookie: w.cookies[actor],
            path: fillPattern(row.page, row.params, w),
          });
          tried++;
          expect(ans.status, ans.text.slice(0, 300)).toBeLessThan(500);
          expect(ans.value?.message ?? "", ans.text.slice(0, 300)).not.toMatch(GENERIC_FAILURE);
          const accepted =
            ans.value?.ok === true || (ans.redirect !== undefined && ans.value === undefined);
          if (accepted) {
            // Only a well-formed list may get through; the rest must be refused.
            if (!ACCEPTS_ANYTHING.has(a.name)) {
              expect(args.length, `accepted ${jsonText(args).slice(0, 200)}`).toBe(valid.length);
            }
            return;
          }
          // Either a refusal with words, or Next's own 4xx for a body it cannot decode.
          if (ans.status >= 400) return;
          expect(ans.value?.ok, ans.text.slice(0, 300)).toBe(false);
          expect((ans.value?.message ?? "").length).toBeGreaterThan(3);
          expect(changedTables(before, await tableChecksums(knex))).toEqual([]);
        }),
        fcOptions(),
      );
    });
  }
});
