/**
 * The platform fee in integer minor units. The percentage always comes from the caller (the app
 * passes `env().PLATFORM_FEE_PERCENT`); there is no default here on purpose.
 *
 * Arithmetic is exact: the percentage is read as the decimal it prints as (12.5, 33.333) and the
 * fee is computed with BigInt, so no binary floating-point error can tip a rounding either way.
 */

export interface FeeSplit {
  /** What the platform keeps. */
  feeMinor: number;
  /** What the reviewer is paid. */
  payoutMinor: number;
}

export interface RefundSplit extends FeeSplit {
  /** What goes back to the homeowner. */
  refundMinor: number;
}

function assertMinor(value: number, name: string): void {
  if (!Number.isSafeInteger(value) || value < 0)
    throw new RangeError(`${name} must be a whole, non-negative number of minor units`);
}

/** A percentage in [0, 100] as an exact fraction numerator / denominator (denominator a power of ten). */
function percentFraction(feePercent: number): { num: bigint; den: bigint } {
  if (typeof feePercent !== "number" || !Number.isFinite(feePercent))
    throw new RangeError("feePercent must be a number");
  if (feePercent < 0 || feePercent > 100) throw new RangeError("feePercent must be from 0 to 100");
  // The shortest decimal that reads back as this number (what a person typed), e.g. "12.5", "1e-7".
  const m = /^(\d+)(?:\.(\d+))?(?:e([+-]\d+))?$/.exec(String(feePercent));
  if (!m) throw new RangeError("feePercent must be a plain decimal number");
  const digits = `${m[1]}${m[2] ?? ""}`;
  const scale = (m[2]?.length ?? 0) - Number(m[3] ?? 0);
  if (scale <= 0) return { num: BigInt(digits) * 10n ** BigInt(-scale), den: 100n };
  return { num: BigInt(digits), den: 100n * 10n ** BigInt(scale) };
}

/** amount × fraction, rounded to the nearest whole unit, halves up. */
function roundHalfUp(amount: bigint, num: bigint, den: bigint): bigint {
  return (2n * amount * num + den) / (2n * den);
}

/**
 * Split a payment into the platform fee and the reviewer's payout.
 * The fee is `amountMinor × feePercent / 100` rounded to the nearest minor unit, halves up;
 * the payout is the rest, so `feeMinor + payoutMinor === amountMinor` always.
 */
export function splitFee(amountMinor: number, feePercent: number): FeeSplit {
  assertMinor(amountMinor, "amountMinor");
  const { num, den } = percentFraction(feePercent);
  const fee = Number(roundHalfUp(BigInt(amountMinor), num, den));
  return { feeMinor: fee, payoutMinor: amountMinor - fee };
}

/**
 * Split a payment when a dispute is settled with a refund of `refundMinor` to the homeowner.
 *
 * The rule: the refund goes back in full and the platform takes no fee on it; the part the
 * reviewer keeps (`amountMinor - refundMinor`) is split like any release, with the fee on that
 * part only (rounded halves up, as in `splitFee`). So a full refund pays no fee and no payout,
 * a refund of 0 is the same as a release, and `refundMinor + feeMinor + payoutMinor === amountMinor`.
 */
export function refundSplit(
  amountMinor: number,
  refundMinor: number,
  feePercent: number,
): RefundSplit {
  assertMinor(amountMinor, "amountMinor");
  assertMinor(refundMinor, "refundMinor");
  if (refundMinor > amountMinor)
    throw new RangeError("refundMinor cannot be more than the amount paid");
  const kept = splitFee(amountMinor - refundMinor, feePercent);
  return { refundMinor, ...kept };
}
