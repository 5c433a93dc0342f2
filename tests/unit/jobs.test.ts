import { describe, expect, it } from "vitest";
import { readdirSync, readFileSync } from "node:fs";
import fc from "fast-check";
import * as lucide from "lucide-react";
import {
  canTransition,
  disputeOpenUntil,
  FUNDS_HELD_STATES,
  isFundsHeld,
  isJobState,
  isTerminal,
  isWithinDisputeWindow,
  JOB_STATES,
  nextActions,
  refundSplit,
  refusalStatus,
  splitFee,
  STATE_DESCRIPTIONS,
  STATE_ICONS,
  STATE_LABELS,
  STATE_LABELS_FOR,
  stateLabel,
  TERMINAL_STATES,
  TRANSITION_NAMES,
  TRANSITIONS,
  type JobActor,
  type JobFacts,
  type JobState,
  type RefusalCode,
  type TransitionName,
} from "@/lib/jobs";

// ---------------------------------------------------------------------------------------------
// The expected machine, written out by hand from product.md ("Job states", "The main flow" step
// 8) and the brief for issue 10, independently of lib/jobs/state-machine.ts.
// ---------------------------------------------------------------------------------------------

const HOMEOWNER = 101;
const REVIEWER = 202;
const actors = {
  ownHomeowner: { id: HOMEOWNER, role: "homeowner" },
  otherHomeowner: { id: 999, role: "homeowner" },
  ownReviewer: { id: REVIEWER, role: "reviewer" },
  otherReviewer: { id: 998, role: "reviewer" },
  // An admin's id that happens to equal the homeowner's must not make them an owner.
  admin: { id: HOMEOWNER, role: "admin" },
  system: { role: "system" },
} satisfies Record<string, JobActor>;
type ActorKind = keyof typeof actors;
const ACTOR_KINDS = Object.keys(actors) as ActorKind[];

type Phase = "window open" | "window closed";
const PHASES: Phase[] = ["window open", "window closed"];
const NOW = new Date("2026-06-10T12:00:00.000Z");
const job = (state: JobState, phase: Phase): JobFacts => ({
  state,
  homeownerId: HOMEOWNER,
  reviewerId: REVIEWER,
  releaseDueAt:
    phase === "window open"
      ? new Date(NOW.getTime() + 3 * 86_400_000)
      : new Date(NOW.getTime() - 60_000),
});

const EXPECTED_EDGES: Record<TransitionName, [JobState, JobState]> = {
  fund: ["awaiting_payment", "funded"],
  cancel: ["awaiting_payment", "cancelled"],
  cancelForRefund: ["funded", "refunded"],
  startReview: ["funded", "in_review"],
  deliver: ["in_review", "delivered"],
  release: ["delivered", "released"],
  openDispute: ["delivered", "disputed"],
  settleRelease: ["disputed", "released"],
  settlePartialRefund: ["disputed", "partially_refunded"],
  settleFullRefund: ["disputed", "refunded"],
};

/** Who may do what, and in which window phase; every other combination is refused. */
const ALLOWED: { t: TransitionName; who: ActorKind; phases: Phase[] }[] = [
  { t: "fund", who: "system", phases: PHASES },
  { t: "cancel", who: "ownHomeowner", phases: PHASES },
  { t: "cancel", who: "system", phases: PHASES },
  { t: "cancelForRefund", who: "ownHomeowner", phases: PHASES },
  { t: "startReview", who: "ownReviewer", phases: PHASES },
  { t: "deliver", who: "ownReviewer", phases: PHASES },
  { t: "release", who: "ownHomeowner", phases: PHASES },
  { t: "release", who: "system", phases: ["window closed"] },
  { t: "openDispute", who: "ownHomeowner", phases: ["window open"] },
  { t: "settleRelease", who: "admin", phases: PHASES },
  { t: "settlePartialRefund", who: "admin", phases: PHASES },
  { t: "settleFullRefund", who: "admin", phases: PHASES },
];

function expected(
  state: JobState,
  t: TransitionName,
  who: ActorKind,
  phase: Phase,
): { ok: true; to: JobState } | { ok: false; code: RefusalCode } {
  const entry = ALLOWED.find((a) => a.t === t && a.who === who);
  if (!entry) return { ok: false, code: "forbidden" };
  if (state !== EXPECTED_EDGES[t][0]) return { ok: false, code: "wrong_state" };
  if (!entry.phases.includes(phase))
    return { ok: false, code: phase === "window open" ? "window_open" : "window_closed" };
  return { ok: true, to: EXPECTED_EDGES[t][1] };
}

const cases = JOB_STATES.flatMap((state) =>
  TRANSITION_NAMES.flatMap((t) =>
    ACTOR_KINDS.flatMap((who) =>
      PHASES.map((phase) => ({ state, t, who, phase, want: expected(state, t, who, phase) })),
    ),
  ),
);

const plainEnglish = (s: string) => {
  expect(s.length).toBeGreaterThan(10);
  expect(s).toMatch(/[.]$/);
  expect(s).not.toMatch(/_|\b(cancelForRefund|startReview|openDispute|settle[A-Z]\w*)\b/);
};

describe("job transitions: every state × transition × actor × dispute-window phase", () => {
  it("covers the whole cross product", () => {
    expect(cases).toHaveLength(
      JOB_STATES.length * TRANSITION_NAMES.length * ACTOR_KINDS.length * PHASES.length,
    );
    expect(cases.filter((c) => c.want.ok)).toHaveLength(
      ALLOWED.reduce((n, a) => n + a.phases.length, 0),
    );
  });

  it.each(cases.map((c) => [`${c.state} · ${c.t} · ${c.who} · ${c.phase}`, c] as const))(
    "%s",
    (_name, { state, t, who, phase, want }) => {
      const got = canTransition(job(state, phase), t, actors[who], NOW);
      if (want.ok) {
        expect(got).toMatchObject({ ok: true, rule: { name: t, from: state, to: want.to } });
      } else {
        expect(got).toMatchObject({ ok: false, code: want.code });
        if (!got.ok) plainEnglish(got.reason);
      }
    },
  );
});

describe("job transitions: data and edge cases", () => {
  it("keeps lib/jobs pure: it imports only its own modules (no database, framework or React)", () => {
    const files = readdirSync("lib/jobs").filter((f) => f.endsWith(".ts"));
    expect(files.length).toBeGreaterThan(3);
    for (const f of files) {
      const source = readFileSync(`lib/jobs/${f}`, "utf8");
      const specifiers = [...source.matchAll(/(?:from|import)\s*\(?\s*["']([^"']+)["']/g)].map(
        (m) => m[1],
      );
      for (const s of specifiers) expect(s, `${f} imports ${s}`).toMatch(/^\.\/[a-z-]+$/);
    }
  });

  it("has exactly the edges of product.md, each named once", () => {
    expect(Object.keys(TRANSITIONS).sort()).toEqual([...TRANSITION_NAMES].sort());
    for (const name of TRANSITION_NAMES) {
      const rule = TRANSITIONS[name];
      expect(rule.name).toBe(name);
      expect([rule.from, rule.to]).toEqual(EXPECTED_EDGES[name]);
      plainEnglish(rule.summary);
      expect(rule.label).not.toMatch(/_/);
    }
  });

  it("has no way out of a terminal state, a way out of every other, and reaches every state", () => {
    expect([...TERMINAL_STATES].sort()).toEqual(
      ["cancelled", "partially_refunded", "refunded", "released"].sort(),
    );
    for (const s of JOB_STATES) {
      const out = TRANSITION_NAMES.filter((t) => TRANSITIONS[t].from === s);
      expect(out.length === 0, s).toBe(isTerminal(s));
    }
    const reached = new Set<JobState>(["awaiting_payment"]);
    for (let grew = true; grew;) {
      grew = false;
      for (const t of TRANSITION_NAMES) {
        const { from, to } = TRANSITIONS[t];
        if (reached.has(from) && !reached.has(to)) {
          reached.add(to);
          grew = true;
        }
      }
    }
    expect([...reached].sort()).toEqual([...JOB_STATES].sort());
  });

  it("lists the same states as the jobs.state column in the migration", () => {
    const migration = readFileSync("db/migrations/20261201_0003_jobs_and_money.ts", "utf8");
    const block = /t\.enu\("state", \[([^\]]+)\]/.exec(migration)?.[1] ?? "";
    const column = [...block.matchAll(/"([a-z_]+)"/g)].map((m) => m[1]);
    expect(column).toEqual([...JOB_STATES]);
  });

  it("holds the funds exactly between payment and settlement", () => {
    expect([...FUNDS_HELD_STATES]).toEqual(["funded", "in_review", "delivered", "disputed"]);
    expect(JOB_STATES.filter(isFundsHeld)).toEqual([...FUNDS_HELD_STATES]);
  });

  it("refuses a transition it does not know, and a state it does not know", () => {
    const j = job("delivered", "window open");
    expect(canTransition(j, "refundEverything", actors.admin, NOW)).toMatchObject({
      ok: false,
      code: "unknown_transition",
    });
    const odd = { ...j, state: "shipped" as JobState };
    const r = canTransition(odd, "release", actors.ownHomeowner, NOW);
    expect(r).toMatchObject({ ok: false, code: "wrong_state" });
    expect(isJobState("shipped")).toBe(false);
    expect(isJobState("in_review")).toBe(true);
  });

  it("does not tell a stranger what state someone else's job is in", () => {
    const r = canTransition(job("disputed", "window open"), "release", actors.otherHomeowner, NOW);
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.code).toBe("forbidden");
      expect(r.reason).not.toMatch(/dispute/i);
    }
  });

  it("closes the dispute window at its end instant, not a millisecond later", () => {
    const end = new Date("2026-06-10T12:00:00.000Z");
    const j: JobFacts = { ...job("delivered", "window open"), releaseDueAt: end };
    const justBefore = new Date(end.getTime() - 1);
    expect(canTransition(j, "openDispute", actors.ownHomeowner, justBefore).ok).toBe(true);
    expect(canTransition(j, "release", actors.system, justBefore)).toMatchObject({
      code: "window_open",
    });
    expect(canTransition(j, "openDispute", actors.ownHomeowner, end)).toMatchObject({
      code: "window_closed",
    });
    expect(canTransition(j, "release", actors.system, end).ok).toBe(true);
  });

  it("refuses window-bound transitions when no window was recorded, but lets the homeowner release", () => {
    const j: JobFacts = { ...job("delivered", "window open"), releaseDueAt: null };
    expect(canTransition(j, "openDispute", actors.ownHomeowner, NOW)).toMatchObject({
      code: "window_unknown",
    });
    expect(canTransition(j, "release", actors.system, NOW)).toMatchObject({
      code: "window_unknown",
    });
    expect(canTransition(j, "release", actors.ownHomeowner, NOW).ok).toBe(true);
  });

  it("maps refusals to statuses: forbidden 403, unknown 422, the rest 409", () => {
    expect(refusalStatus("forbidden")).toBe(403);
    expect(refusalStatus("unknown_transition")).toBe(422);
    for (const c of ["wrong_state", "window_open", "window_closed", "window_unknown"] as const)
      expect(refusalStatus(c)).toBe(409);
  });
});

describe("nextActions: the buttons on the job page", () => {
  const names = (state: JobState, who: ActorKind, phase: Phase = "window open") =>
    nextActions(job(state, phase), actors[who], NOW).map((r) => r.name);

  it("offers each party its own next step", () => {
    expect(names("awaiting_payment", "ownHomeowner")).toEqual(["cancel"]);
    expect(names("awaiting_payment", "system")).toEqual(["fund", "cancel"]);
    expect(names("funded", "ownHomeowner")).toEqual(["cancelForRefund"]);
    expect(names("funded", "ownReviewer")).toEqual(["startReview"]);
    expect(names("in_review", "ownReviewer")).toEqual(["deliver"]);
    expect(names("in_review", "ownHomeowner")).toEqual([]);
    expect(names("delivered", "ownHomeowner")).toEqual(["release", "openDispute"]);
    expect(names("delivered", "ownHomeowner", "window closed")).toEqual(["release"]);
    expect(names("delivered", "system")).toEqual([]);
    expect(names("delivered", "system", "window closed")).toEqual(["release"]);
    expect(names("disputed", "admin")).toEqual([
      "settleRelease",
      "settlePartialRefund",
      "settleFullRefund",
    ]);
    expect(names("disputed", "ownHomeowner")).toEqual([]);
  });

  it("offers nothing to strangers, and nothing to anyone on a closed job", () => {
    for (const s of JOB_STATES) {
      expect(names(s, "otherHomeowner")).toEqual([]);
      expect(names(s, "otherReviewer")).toEqual([]);
    }
    for (const s of TERMINAL_STATES)
      for (const who of ACTOR_KINDS)
        for (const phase of PHASES) expect(names(s, who, phase)).toEqual([]);
  });
});

describe("state words and icons", () => {
  it("uses our words for the neutral labels", () => {
    expect(STATE_LABELS).toEqual({
      awaiting_payment: "Awaiting payment",
      funded: "Paid, held",
      in_review: "Review in progress",
      delivered: "Report delivered",
      disputed: "In dispute",
      released: "Paid out",
      partially_refunded: "Part refunded",
      refunded: "Refunded",
      cancelled: "Cancelled",
    });
    expect(stateLabel("funded")).toBe("Paid, held");
    expect(stateLabel("funded", "admin")).toBe("Paid, held");
  });

  it("has a label and a description in plain words for every viewer and state", () => {
    for (const viewer of ["homeowner", "reviewer", "admin"] as const)
      for (const s of JOB_STATES) {
        expect(stateLabel(s, viewer)).toBe(STATE_LABELS_FOR[viewer][s]);
        expect(STATE_LABELS_FOR[viewer][s]).toMatch(/^[A-Z][^_]+$/);
        plainEnglish(STATE_DESCRIPTIONS[viewer][s]);
      }
  });

  it("tells the homeowner the money is held while it is held", () => {
    for (const s of FUNDS_HELD_STATES) expect(stateLabel(s, "homeowner")).toMatch(/held/);
    for (const s of TERMINAL_STATES) expect(stateLabel(s, "homeowner")).not.toMatch(/held/);
  });

  it("names an icon lucide-react exports for every state", () => {
    const exported = lucide as unknown as Record<string, unknown>;
    for (const s of JOB_STATES) expect(exported[STATE_ICONS[s]], STATE_ICONS[s]).toBeDefined();
    expect(new Set(Object.values(STATE_ICONS)).size).toBe(JOB_STATES.length);
  });
});

// ---------------------------------------------------------------------------------------------
// Fees. The reference below is independent of lib/jobs/fees.ts: the percentage arrives as an
// integer numerator over a power of ten, and the fee is rounded halves up in BigInt.
// ---------------------------------------------------------------------------------------------

const referenceFee = (amount: number, num: number, decimals: number) => {
  const den = 100n * 10n ** BigInt(decimals);
  return Number((2n * BigInt(amount) * BigInt(num) + den) / (2n * den));
};

describe("splitFee", () => {
  it.each([
    // [amount, percent, fee] — worked by hand: fee = amount × percent / 100, halves up
    [0, 12, 0],
    [1, 12, 0], // 0.12 → 0
    [1, 50, 1], // 0.5 → 1 (half up)
    [1, 100, 1],
    [8500, 12, 1020],
    [10_000, 12.5, 1250],
    [2, 12.5, 0], // 0.25 → 0
    [4, 12.5, 1], // 0.5 → 1
    [12, 12.5, 2], // 1.5 → 2
    [3, 33.333, 1], // 0.99999 → 1
    [15, 33.333, 5], // 4.99995 → 5
    [150, 33.333, 50], // 49.9995 → 50
    [149, 33.333, 50], // 49.66617 → 50
    [1, 0, 0],
    [99_999, 0, 0],
    // Halves that binary floating point lands just below: Math.round(a * p / 100) gets these wrong.
    [5500, 0.7, 39], // 38.5 → 39
    [3000, 4.35, 131], // 130.5 → 131
    [1500, 8.7, 131], // 130.5 → 131
    // The largest safe integer: 9007199254740991 × 0.12 = 1080863910568918.92 → …919
    [Number.MAX_SAFE_INTEGER, 12, 1_080_863_910_568_919],
    [4_294_967_295, 33.333, 1_431_641_448], // 1431641448.44… (the column's unsigned int max)
  ])("%i at %s per cent → fee %i", (amount, percent, fee) => {
    const split = splitFee(amount, percent);
    expect(split.feeMinor).toBe(fee);
    expect(split.payoutMinor).toBe(amount - fee);
  });

  it("always sums to the amount, exactly as the reference, for any amount and percentage", () => {
    fc.assert(
      fc.property(
        fc.nat({ max: Number.MAX_SAFE_INTEGER }),
        fc
          .integer({ min: 0, max: 4 })
          .chain((decimals) =>
            fc.tuple(fc.integer({ min: 0, max: 100 * 10 ** decimals }), fc.constant(decimals)),
          ),
        (amount, [num, decimals]) => {
          const percent = num / 10 ** decimals;
          const { feeMinor, payoutMinor } = splitFee(amount, percent);
          expect(Number.isSafeInteger(feeMinor) && Number.isSafeInteger(payoutMinor)).toBe(true);
          expect(feeMinor).toBeGreaterThanOrEqual(0);
          expect(payoutMinor).toBeGreaterThanOrEqual(0);
          expect(feeMinor + payoutMinor).toBe(amount);
          expect(feeMinor).toBe(referenceFee(amount, num, decimals));
        },
      ),
      { numRuns: 1000 },
    );
  });

  it("sums to the amount for arbitrary doubles as percentages too", () => {
    fc.assert(
      fc.property(
        fc.nat({ max: 1_000_000_000 }),
        fc.double({ min: 0, max: 100, noNaN: true }),
        (amount, percent) => {
          const { feeMinor, payoutMinor } = splitFee(amount, percent);
          expect(feeMinor + payoutMinor).toBe(amount);
          expect(feeMinor).toBeGreaterThanOrEqual(0);
          expect(feeMinor).toBeLessThanOrEqual(amount);
          // Within half a unit of the real-valued fee.
          expect(Math.abs(feeMinor - (amount * percent) / 100)).toBeLessThanOrEqual(0.5 + 1e-6);
        },
      ),
      { numRuns: 1000 },
    );
  });

  it("never takes a smaller fee from a larger amount", () => {
    fc.assert(
      fc.property(
        fc.nat({ max: 10_000_000 }),
        fc.nat({ max: 10_000_000 }),
        fc.integer({ min: 0, max: 50_000 }),
        (a, b, num) => {
          const [lo, hi] = a <= b ? [a, b] : [b, a];
          expect(splitFee(lo, num / 1000).feeMinor).toBeLessThanOrEqual(
            splitFee(hi, num / 1000).feeMinor,
          );
        },
      ),
    );
  });

  it("rejects amounts that are not whole non-negative minor units, and percentages outside 0–100", () => {
    for (const bad of [-1, 1.5, Number.NaN, Infinity, Number.MAX_SAFE_INTEGER + 1])
      expect(() => splitFee(bad, 12), String(bad)).toThrow(RangeError);
    for (const bad of [-0.01, 100.01, Number.NaN, Infinity])
      expect(() => splitFee(100, bad), String(bad)).toThrow(RangeError);
    expect(() => splitFee("100" as unknown as number, 12)).toThrow(RangeError);
  });

  it("reads very small percentages exactly (written in exponent form)", () => {
    // 1e-7 % is a fraction 10^-9: 10^13 × 10^-9 = 10 000; 2.5e-7 % of 10^13 = 25 000.
    expect(splitFee(10_000_000_000_000, 1e-7).feeMinor).toBe(10_000);
    expect(splitFee(10_000_000_000_000, 2.5e-7).feeMinor).toBe(25_000);
  });
});

describe("refundSplit (partial refund: no fee on the refund, the fee on the part kept)", () => {
  it.each([
    // [amount, refund, percent, fee, payout] — kept = amount − refund; fee = kept × % halves up
    [10_000, 0, 12, 1200, 8800],
    [10_000, 10_000, 12, 0, 0],
    [10_000, 5000, 12, 600, 4400],
    [9100, 4550, 12.5, 569, 3981], // kept 4550 × 12.5% = 568.75 → 569
    [1, 1, 12, 0, 0],
    [1, 0, 50, 1, 0],
    [3, 1, 33.333, 1, 1], // kept 2 × 33.333% = 0.66666 → 1
  ])(
    "%i paid, %i refunded at %s per cent → fee %i, payout %i",
    (amount, refund, pct, fee, payout) => {
      expect(refundSplit(amount, refund, pct)).toEqual({
        refundMinor: refund,
        feeMinor: fee,
        payoutMinor: payout,
      });
    },
  );

  it("always sums to the amount; a refund of 0 is a release and a full refund pays nothing out", () => {
    fc.assert(
      fc.property(
        fc
          .nat({ max: Number.MAX_SAFE_INTEGER })
          .chain((amount) => fc.tuple(fc.constant(amount), fc.integer({ min: 0, max: amount }))),
        fc.integer({ min: 0, max: 1_000_000 }),
        ([amount, refund], num) => {
          const pct = num / 10_000;
          const s = refundSplit(amount, refund, pct);
          expect(s.refundMinor + s.feeMinor + s.payoutMinor).toBe(amount);
          expect(Math.min(s.refundMinor, s.feeMinor, s.payoutMinor)).toBeGreaterThanOrEqual(0);
          expect(s.feeMinor).toBe(referenceFee(amount - refund, num, 4));
          expect(refundSplit(amount, 0, pct)).toEqual({ refundMinor: 0, ...splitFee(amount, pct) });
          expect(refundSplit(amount, amount, pct)).toEqual({
            refundMinor: amount,
            feeMinor: 0,
            payoutMinor: 0,
          });
        },
      ),
      { numRuns: 1000 },
    );
  });

  it("rejects a refund larger than the payment, or not in whole minor units", () => {
    expect(() => refundSplit(100, 101, 12)).toThrow(/more than the amount/);
    expect(() => refundSplit(100, -1, 12)).toThrow(RangeError);
    expect(() => refundSplit(100, 0.5, 12)).toThrow(RangeError);
    expect(() => refundSplit(-100, 0, 12)).toThrow(RangeError);
    expect(() => refundSplit(100, 10, 101)).toThrow(RangeError);
  });
});

describe("the dispute window", () => {
  it("closes windowDays × 24 hours after delivery", () => {
    const delivered = new Date("2026-03-01T10:15:30.250Z");
    expect(disputeOpenUntil(delivered, 7).toISOString()).toBe("2026-03-08T10:15:30.250Z");
    expect(disputeOpenUntil(delivered, 1).toISOString()).toBe("2026-03-02T10:15:30.250Z");
    // Across the UK clock change (29 March 2026) the window is still 168 hours.
    const beforeChange = new Date("2026-03-25T09:00:00.000Z");
    const end = disputeOpenUntil(beforeChange, 7);
    expect(end.getTime() - beforeChange.getTime()).toBe(168 * 3_600_000);
  });

  it("is open before the end and closed from the end instant on", () => {
    const end = new Date("2026-03-08T10:00:00.000Z");
    expect(isWithinDisputeWindow(end, new Date("2026-03-08T09:59:59.999Z"))).toBe(true);
    expect(isWithinDisputeWindow(end, end)).toBe(false);
    expect(isWithinDisputeWindow(end, new Date("2026-03-09T00:00:00.000Z"))).toBe(false);
  });

  it("rejects a window that is not a whole number of days, and invalid dates", () => {
    const d = new Date("2026-03-01T10:00:00Z");
    for (const bad of [0, -1, 1.5, Number.NaN]) expect(() => disputeOpenUntil(d, bad)).toThrow();
    expect(() => disputeOpenUntil(new Date("not a date"), 7)).toThrow(RangeError);
    expect(() => isWithinDisputeWindow(new Date("nope"), d)).toThrow(RangeError);
  });
});
