/**
 * The words of the job state machine: what each refusal says, who it says may act, and the
 * label and summary of each step. People read these as they are (RULES: words, never codes),
 * so each is stated here exactly.
 */
import { describe, expect, it } from "vitest";
import {
  canTransition,
  refusalStatus,
  TRANSITION_NAMES,
  TRANSITIONS,
  type JobFacts,
} from "@/lib/jobs";

const job = (o: Partial<JobFacts> = {}): JobFacts => ({
  state: "delivered",
  homeownerId: 1,
  reviewerId: 2,
  releaseDueAt: new Date("2031-01-08T10:00:00Z"),
  ...o,
});
const homeowner = { id: 1, role: "homeowner" } as const;
const reviewer = { id: 2, role: "reviewer" } as const;
const admin = { id: 9, role: "admin" } as const;
const system = { role: "system" } as const;
const before = new Date("2031-01-05T00:00:00Z");
const after = new Date("2031-01-09T00:00:00Z");

const reason = (c: ReturnType<typeof canTransition>) =>
  c.ok ? "allowed" : `${c.code}: ${c.reason}`;

describe("refusals say why, in plain words", () => {
  it("an unknown step", () => {
    expect(reason(canTransition(job(), "explode", homeowner))).toBe(
      "unknown_transition: That is not something that can be done to a job.",
    );
  });

  it("names who may act, with 'of this job' for owners and the team for admins", () => {
    expect(reason(canTransition(job({ state: "awaiting_payment" }), "fund", homeowner))).toBe(
      "forbidden: Only Loopwright can do this, once the payment is confirmed.",
    );
    expect(reason(canTransition(job(), "release", reviewer))).toBe(
      "forbidden: Only the homeowner of this job can do this.",
    );
    expect(reason(canTransition(job({ state: "disputed" }), "settleRelease", homeowner))).toBe(
      "forbidden: Only the Loopwright team can do this.",
    );
    expect(reason(canTransition(job({ state: "funded" }), "startReview", homeowner))).toBe(
      "forbidden: Only the reviewer of this job can do this.",
    );
  });

  it("refuses the homeowner or reviewer of another job as forbidden", () => {
    const other = { id: 5, role: "homeowner" } as const;
    expect(reason(canTransition(job(), "release", other))).toBe(
      "forbidden: Only the homeowner of this job can do this.",
    );
    const otherReviewer = { id: 1, role: "reviewer" } as const;
    expect(canTransition(job({ state: "funded" }), "startReview", otherReviewer)).toMatchObject({
      ok: false,
      code: "forbidden",
    });
    // The system and admins own nothing and need not: the system cancels any unpaid job.
    expect(canTransition(job({ state: "awaiting_payment" }), "cancel", system).ok).toBe(true);
  });

  it("names the current state and the state the step needs", () => {
    expect(reason(canTransition(job({ state: "funded" }), "release", homeowner))).toBe(
      'wrong_state: This job\'s status is "Paid, held"; "Release the payment" is only possible while it is "Report delivered".',
    );
    expect(
      reason(canTransition(job({ state: "nonsense" as never }), "release", homeowner)),
    ).toMatch(/^wrong_state: This job's status is unknown;/);
  });

  it("the dispute window: unknown, closed for a dispute, open for the automatic release", () => {
    expect(reason(canTransition(job({ releaseDueAt: null }), "openDispute", homeowner))).toBe(
      "window_unknown: This job has no dispute window recorded, so this cannot be done yet. Please contact the Loopwright team.",
    );
    expect(
      reason(canTransition(job({ releaseDueAt: new Date(Number.NaN) }), "openDispute", homeowner)),
    ).toMatch(/^window_unknown:/);
    expect(reason(canTransition(job(), "openDispute", homeowner, after))).toBe(
      "window_closed: The dispute window for this report has closed, so a dispute can no longer be opened.",
    );
    expect(canTransition(job(), "openDispute", homeowner, before).ok).toBe(true);
    expect(reason(canTransition(job(), "release", system, before))).toBe(
      "window_open: The dispute window for this report is still open; the payment is released automatically only after it closes.",
    );
    expect(canTransition(job(), "release", system, after).ok).toBe(true);
    // The homeowner releases early; an admin is not bound by the window either.
    expect(canTransition(job(), "release", homeowner, before).ok).toBe(true);
    expect(canTransition(job({ state: "disputed" }), "settleRelease", admin, before).ok).toBe(true);
  });

  it("maps each refusal to its status", () => {
    expect(refusalStatus("forbidden")).toBe(403);
    expect(refusalStatus("unknown_transition")).toBe(422);
    for (const c of ["wrong_state", "window_open", "window_closed", "window_unknown"] as const)
      expect(refusalStatus(c)).toBe(409);
  });
});

describe("each step has its own label and summary", () => {
  it("labels and summaries are distinct sentences", () => {
    const labels = TRANSITION_NAMES.map((n) => TRANSITIONS[n].label);
    const summaries = TRANSITION_NAMES.map((n) => TRANSITIONS[n].summary);
    expect(new Set(labels).size).toBe(TRANSITION_NAMES.length);
    expect(new Set(summaries).size).toBe(TRANSITION_NAMES.length);
    for (const l of labels) expect(l).toMatch(/^[A-Z][a-z].{4,}$/);
    for (const s of summaries) expect(s).toMatch(/^[A-Z].{15,}\.$/);
    for (const n of TRANSITION_NAMES) expect(TRANSITIONS[n].name).toBe(n);
  });
});
