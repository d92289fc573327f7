// npm run bench: prints the performance figures; never asserts. Each part is its own script.
import { spawnSync } from "node:child_process";
import { existsSync } from "node:fs";

const parts = ["scripts/bench-engine.ts", "scripts/bench-http.ts", "scripts/bench-lighthouse.ts"];
for (const part of parts) {
  if (!existsSync(part)) continue;
  console.log(`\n== ${part} ==`);
  const r = spawnSync("node_modules/.bin/tsx", [part], { stdio: "inherit" });
  if (r.status !== 0) process.exitCode = 1;
}
