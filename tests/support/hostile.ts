/**
 * fast-check arbitraries for hostile input: wrong types, missing and unknown fields, huge
 * strings, deep nesting, unicode edge cases, NaN and infinities, negative and enormous numbers,
 * SQL-looking and HTML strings. `HOSTILE_SEED` and `HOSTILE_RUNS` set the seed and the number of
 * runs (a fixed seed and a few runs in `npm test`; `npm run soak` runs many with a fresh seed).
 */
import fc from "fast-check";

export const HOSTILE_SEED = Number(process.env.HOSTILE_SEED ?? 20261202);
export const HOSTILE_RUNS = Number(process.env.HOSTILE_RUNS ?? 12);
export const fcOptions = () => ({ seed: HOSTILE_SEED, numRuns: HOSTILE_RUNS, endOnFailure: true });

export const NASTY_STRINGS = [
  "",
  " ",
  "\u0000",
  "\uFEFF",
  "\uD800",
  "\u202Egnp.exe",
  "Z\u0351\u0363\u0365a\u0306\u033Ely\u0317",
  "👩‍👩‍👧‍👦🏳️‍🌈",
  "𝕷𝖔𝖔𝖕",
  "' OR '1'='1' --",
  '"; DROP TABLE users; --',
  "1; SELECT SLEEP(5)",
  "<script>alert(1)</script>",
  '<img src=x onerror="alert(1)">',
  "javascript:alert(1)",
  "../../../../etc/passwd",
  "${7*7}{{7*7}}",
  "$K1",
  "$@0",
  "__proto__",
  "constructor",
  "NaN",
  "-1",
  "0",
  "1e308",
  "9".repeat(400),
  "٣",
];

export const hugeString = fc.integer({ min: 5_000, max: 300_000 }).map((n) => "é".repeat(n));

export const hostileString = fc.oneof(
  fc.constantFrom(...NASTY_STRINGS),
  fc.string({ maxLength: 40 }),
  fc.string({ unit: "grapheme", maxLength: 40 }),
  fc.string({ unit: "binary", maxLength: 40 }),
  hugeString,
);

export const hostileNumber = fc.oneof(
  fc.constantFrom(NaN, Infinity, -Infinity, -0, -1, 0, 2 ** 53, 2 ** 64, 1e308, -1e308, 5e-324),
  fc.double(),
  fc.integer(),
);

/** Arrays or objects nested `depth` deep. */
export const deepNesting = fc
  .tuple(fc.integer({ min: 20, max: 2_000 }), fc.boolean())
  .map(([depth, asArray]) => {
    let v: unknown = "bottom";
    for (let i = 0; i < depth; i++) v = asArray ? [v] : { a: v };
    return v;
  });

export const hostileLeaf: fc.Arbitrary<unknown> = fc.oneof(
  hostileString,
  hostileNumber,
  fc.boolean(),
  fc.constant(null),
  fc.constant(undefined),
  fc.bigInt(),
);

export const hostileValue: fc.Arbitrary<unknown> = fc.oneof(
  { weight: 4, arbitrary: hostileLeaf },
  { weight: 1, arbitrary: deepNesting },
  { weight: 1, arbitrary: fc.array(hostileLeaf, { maxLength: 5 }) },
  {
    weight: 2,
    arbitrary: fc.dictionary(
      fc.oneof(fc.constantFrom(...NASTY_STRINGS.filter(Boolean)), fc.string({ minLength: 1 })),
      hostileLeaf,
      { maxKeys: 6, noNullPrototype: true },
    ),
  },
);

/**
 * A hostile version of a valid object: fields dropped, replaced by hostile values, or joined by
 * unknown ones. `changed` lists the known fields it broke (dropped or replaced).
 */
export function mutated(
  valid: Record<string, string | string[]>,
): fc.Arbitrary<{ value: Record<string, unknown>; changed: string[] }> {
  const keys = Object.keys(valid);
  return fc
    .tuple(
      fc.subarray(keys),
      fc.subarray(keys),
      fc.array(hostileValue, { minLength: keys.length, maxLength: keys.length }),
      fc.dictionary(fc.string({ minLength: 1, maxLength: 20 }), hostileLeaf, {
        maxKeys: 3,
        noNullPrototype: true,
      }),
    )
    .map(([drop, replace, values, extra]) => {
      const value: Record<string, unknown> = { ...extra, ...valid };
      for (const k of drop) delete value[k];
      replace.forEach((k) => (value[k] = values[keys.indexOf(k)]));
      return { value, changed: [...new Set([...drop, ...replace])] };
    });
}

/** A form's fields as a browser could send them: any name, any text (no types but strings). */
export const hostileFormFields = fc.dictionary(
  fc.oneof(
    fc.constantFrom(
      "jobId",
      "projectId",
      "requestId",
      "quoteId",
      "title",
      "reason",
      "$ACTION_ID_x",
      "__proto__",
    ),
    fc.string({ minLength: 1, maxLength: 20 }),
  ),
  fc.oneof(hostileString, hostileNumber.map(String)),
  { maxKeys: 6, noNullPrototype: true },
);
