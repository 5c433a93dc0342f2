/**
 * What the money and dispute-window rules say when they are called wrongly: each refusal names
 * the argument and the rule, so a programming mistake is found from its message alone.
 */
import { describe, expect, it } from "vitest";
import { disputeOpenUntil, isWithinDisputeWindow, refundSplit, splitFee } from "@/lib/jobs";

describe("refusals of the money rules", () => {
  it("names the amount or refund that is not whole minor units", () => {
    const msg = (name: string) => `${name} must be a whole, non-negative number of minor units`;
    expect(() => splitFee(-1, 12)).toThrow(msg("amountMinor"));
    expect(() => splitFee(1.5, 12)).toThrow(msg("amountMinor"));
    expect(() => refundSplit(-1, 0, 12)).toThrow(msg("amountMinor"));
    expect(() => refundSplit(100, -1, 12)).toThrow(msg("refundMinor"));
  });

  it("says what is wrong with the percentage", () => {
    expect(() => splitFee(100, Number.NaN)).toThrow("feePercent must be a number");
    expect(() => splitFee(100, Number.POSITIVE_INFINITY)).toThrow("feePercent must be a number");
    expect(() => splitFee(100, "12" as never)).toThrow("feePercent must be a number");
    expect(() => splitFee(100, -0.5)).toThrow("feePercent must be from 0 to 100");
    expect(() => splitFee(100, 100.5)).toThrow("feePercent must be from 0 to 100");
    expect(splitFee(100, 100)).toEqual({ feeMinor: 100, payoutMinor: 0 });
    expect(splitFee(100, 0)).toEqual({ feeMinor: 0, payoutMinor: 100 });
  });

  it("reads whole, decimal and exponent percentages exactly (by hand)", () => {
    // 10 % of 1005 = 100.5 → 101 (halves up); 12.5 % of 1000 = 125; 1e-7 % of 10^12 = 1000.
    expect(splitFee(1005, 10).feeMinor).toBe(101);
    expect(splitFee(1000, 12.5).feeMinor).toBe(125);
    expect(splitFee(1_000_000_000_000, 1e-7).feeMinor).toBe(1000);
    expect(splitFee(1_000_000, 5e-7).feeMinor).toBe(0);
    expect(splitFee(300, 33.333).feeMinor).toBe(100);
  });
});

describe("refusals of the dispute window", () => {
  const d = new Date("2031-01-01T00:00:00Z");
  it("names the date that is not valid and the rule for the days", () => {
    expect(() => disputeOpenUntil(new Date(Number.NaN), 7)).toThrow(
      "deliveredAt must be a valid date",
    );
    expect(() => disputeOpenUntil("2031-01-01" as never, 7)).toThrow(
      "deliveredAt must be a valid date",
    );
    expect(() => disputeOpenUntil(d, 0)).toThrow(
      "windowDays must be a whole number of days, at least 1",
    );
    expect(() => disputeOpenUntil(d, 1.5)).toThrow(
      "windowDays must be a whole number of days, at least 1",
    );
    expect(disputeOpenUntil(d, 1).toISOString()).toBe("2031-01-02T00:00:00.000Z");
    expect(() => isWithinDisputeWindow(new Date(Number.NaN), d)).toThrow(
      "openUntil must be a valid date",
    );
    expect(() => isWithinDisputeWindow(d, new Date(Number.NaN))).toThrow(
      "now must be a valid date",
    );
  });
});
