import { type ChildProcessWithoutNullStreams, spawn } from "node:child_process";
import path from "node:path";

// Runs `npm run backup` / `npm run restore` (db/backup.ts) as its own process on a data folder,
// as an operator would, and collects what it printed.

const TSX = path.resolve(__dirname, "../../node_modules/.bin/tsx");
const SCRIPT = path.resolve(__dirname, "../../db/backup.ts");

export interface ScriptOutcome {
  code: number | null;
  stdout: string;
  stderr: string;
}

/** The script with these arguments on `dataDir`, in the test's environment; `unset` removes variables from it. */
export function runBackupScript(args: string[], dataDir: string, unset: string[] = []): Promise<ScriptOutcome> {
  return new Promise((resolve, reject) => {
    const env: NodeJS.ProcessEnv = { ...process.env, STEAMLANE_DATA_DIR: dataDir };
    for (const name of ["DATABASE_PATH", "UPLOADS_DIR", ...unset]) delete env[name];
    const child = spawn(TSX, [SCRIPT, ...args], { env, stdio: "pipe" }) as unknown as ChildProcessWithoutNullStreams;
    let stdout = "";
    let stderr = "";
    child.stdout.on("data", (c: Buffer) => (stdout += c.toString()));
    child.stderr.on("data", (c: Buffer) => (stderr += c.toString()));
    child.on("error", reject);
    child.on("close", (code: number | null) => resolve({ code, stdout, stderr }));
  });
}
