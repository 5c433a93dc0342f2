/**
 * Benchmark: median time of runLoopCheck for the example system and for 1,000 random valid
 * systems. Target: under 0.5 ms median per system on the project's 2-core machine.
 *   npm run bench
 */
import fc from "fast-check";
import { runLoopCheck } from "@/lib/calc/loop-check";
import { demoSystem } from "@/lib/calc/demo-system";
import { arbitrarySystem } from "../support/arbitrary-system";

const median = (xs: number[]) => {
  const s = [...xs].sort((a, b) => a - b);
  const mid = s.length >> 1;
  return s.length % 2 ? s[mid]! : (s[mid - 1]! + s[mid]!) / 2;
};
const pct = (xs: number[], p: number) =>
  [...xs].sort((a, b) => a - b)[Math.min(xs.length - 1, Math.floor(xs.length * p))]!;

function time(fn: () => unknown): number {
  const t0 = performance.now();
  fn();
  return performance.now() - t0;
}

// Warm up the JIT so the figures describe a running server, not a cold start.
for (let i = 0; i < 500; i++) runLoopCheck(demoSystem);

const demoTimes = Array.from({ length: 2000 }, () => time(() => runLoopCheck(demoSystem)));

const systems = fc.sample(arbitrarySystem, { numRuns: 1000, seed: 20261201 });
const randomTimes = systems.map((s) => {
  // Median of 5 runs per system, so one GC pause does not count against a system.
  return median(Array.from({ length: 5 }, () => time(() => runLoopCheck(s))));
});

const fmt = (ms: number) => `${(ms * 1000).toFixed(1)} µs`;
console.log("runLoopCheck benchmark (target: median < 0.5 ms per system)");
console.log(
  `  example system, 2000 runs:  median ${fmt(median(demoTimes))}, p95 ${fmt(pct(demoTimes, 0.95))}`,
);
console.log(
  `  1000 random valid systems:  median ${fmt(median(randomTimes))}, p95 ${fmt(pct(randomTimes, 0.95))}, max ${fmt(Math.max(...randomTimes))}`,
);
const ok = median(demoTimes) < 0.5 && median(randomTimes) < 0.5;
console.log(ok ? "  within target" : "  OVER TARGET");
