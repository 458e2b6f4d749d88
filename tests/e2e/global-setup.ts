import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import type { TestProject } from "vitest/node";
import { runToEnd, SERVER_CONDITION } from "@/fakes/processes";
import { type Stack, stackEnv, startStack, type StackOptions } from "@/fakes/stack";

// Starts the production build with a fresh demo database and the mail catcher, once for the suite.

declare module "vitest" {
  export interface ProvidedContext {
    appUrl: string;
    mailUrl: string;
    stripeUrl: string;
    dataDir: string;
  }
}

let stack: Stack | undefined;
let dataDir: string | undefined;

export default async function setup(project: TestProject) {
  if (!fs.existsSync(path.join(process.env.NEXT_DIST_DIR || ".next", "BUILD_ID"))) {
    console.log("No production build found: running `next build` first.");
    await runToEnd(path.join("node_modules", ".bin", "next"), ["build"], { NEXT_TELEMETRY_DISABLED: "1" });
  }
  dataDir = fs.mkdtempSync(path.join(os.tmpdir(), "steamlane-e2e-"));
  const options: StackOptions = {
    mode: "production",
    dataDir,
    port: Number(process.env.E2E_PORT ?? 3210),
    mailSmtpPort: Number(process.env.E2E_SMTP_PORT ?? 2525),
    mailWebPort: Number(process.env.E2E_MAIL_WEB_PORT ?? 2580),
    stripePort: Number(process.env.E2E_STRIPE_PORT ?? 12211),
    quiet: !process.env.E2E_VERBOSE,
  };
  await runToEnd(path.join("node_modules", ".bin", "tsx"), [SERVER_CONDITION, "db/seed/index.ts"], stackEnv(options));
  stack = await startStack(options);
  project.provide("appUrl", stack.appUrl);
  project.provide("mailUrl", stack.mailUrl);
  project.provide("stripeUrl", stack.stripeUrl);
  project.provide("dataDir", dataDir);
  return async () => {
    await stack?.stop();
    if (dataDir) fs.rmSync(dataDir, { recursive: true, force: true });
  };
}
