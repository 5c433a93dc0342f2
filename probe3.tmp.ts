import { spawn } from "node:child_process";
import { signInHttp } from "./tests/support/session";
const port = 3390;
const child = spawn(
  process.execPath,
  ["node_modules/next/dist/bin/next", "start", "-H", "127.0.0.1", "-p", String(port)],
  {
    env: {
      ...process.env,
      NODE_ENV: "production",
      DB_NAME: "loopwright_test_bench_data",
      APP_URL: `http://127.0.0.1:${port}`,
      BENCH: "1",
    },
    stdio: ["ignore", "inherit", "inherit"],
  },
);
const base = `http://127.0.0.1:${port}`;
for (let i = 0; i < 200; i++) {
  try {
    if ((await fetch(base + "/api/health")).ok) break;
  } catch {}
  await new Promise((r) => setTimeout(r, 250));
}
const rev = (await signInHttp(base, "sol@demo.loopwright.test", "demo-loop-2026")).cookie;
const home = (await signInHttp(base, "hana@demo.loopwright.test", "demo-loop-2026")).cookie;
for (const [u, c] of [
  ["/requests/1019999", rev],
  ["/dashboard", home],
  ["/", ""],
  ["/api/board", rev],
  ["/api/board?sort=distance", rev],
] as const) {
  for (let i = 0; i < 4; i++) {
    const t = performance.now();
    const r = await fetch(base + u, { headers: { cookie: c }, redirect: "manual" });
    const b = await r.text();
    console.log(
      u,
      r.status,
      b.length,
      (performance.now() - t).toFixed(0) + "ms",
      r.status !== 200 ? b.slice(0, 200) : "",
    );
  }
}
child.kill("SIGTERM");
