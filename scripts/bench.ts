// npm run bench: prints the performance figures; never asserts. Each part is its own script.
// The HTTP part builds the app once (unless `npm run bench -- --skip-build`); the later parts reuse that build.
import { spawnSync } from "node:child_process";
import { existsSync } from "node:fs";

const skipBuild = process.argv.includes("--skip-build");
const parts: { file: string; args: string[]; conditions?: string[] }[] = [
  { file: "scripts/bench-engine.ts", args: [] },
  // The photo part loads the app's own upload code, which is marked server-only: run as the server does.
  { file: "scripts/bench-http.ts", args: skipBuild ? ["--skip-build"] : [], conditions: ["react-server"] },
  { file: "scripts/bench-lighthouse.ts", args: ["--skip-build"] },
];
for (const part of parts) {
  if (!existsSync(part.file)) continue;
  console.log(`\n== ${part.file} ==`);
  const conditions = (part.conditions ?? []).map((c) => `--conditions=${c}`);
  const r = spawnSync("node_modules/.bin/tsx", [...conditions, part.file, ...part.args], { stdio: "inherit" });
  if (r.status !== 0) process.exitCode = 1;
}
