// `npm run bench`: every benchmark in this folder, one after the other (with the server
// condition, so benchmarks may import the app's server modules).
import { spawnSync } from "node:child_process";
import fs from "node:fs";
import path from "node:path";

const here = path.join(process.cwd(), "tests", "bench");
const benches = fs
  .readdirSync(here)
  .filter((f) => f.endsWith(".ts") && f !== "index.ts" && !f.startsWith("_"))
  .sort();

let failed = 0;
for (const bench of benches) {
  console.log(`\n## ${bench}\n`);
  const run = spawnSync(path.join("node_modules", ".bin", "tsx"), ["--conditions=react-server", path.join(here, bench)], { stdio: "inherit" });
  if (run.status !== 0) failed++;
}
process.exit(failed ? 1 : 0);
