// `npm run demo`: a fresh database with the demo scenario, a production build, and the app with
// every local stand-in it needs. `npm run dev`: the same stack on the development server, keeping
// the database. Ctrl-C stops everything.
import fs from "node:fs";
import path from "node:path";
import { DEMO_PASSWORD, DEMO_PEOPLE } from "@/db/seed/people";
import { ROLE_LABELS } from "@/lib/auth/roles";
import { runToEnd, SERVER_CONDITION } from "./processes";
import { stackEnv, startStack, type StackOptions } from "./stack";

async function main() {
  const mode = process.argv[2] === "dev" ? "development" : "production";
  const options: StackOptions = {
    mode,
    dataDir: path.resolve(process.env.STEAMLANE_DATA_DIR ?? (mode === "production" ? "data/demo" : "data/dev")),
    port: Number(process.env.PORT ?? 3000),
    mailSmtpPort: Number(process.env.MAIL_SMTP_PORT ?? 1025),
    mailWebPort: Number(process.env.MAIL_WEB_PORT ?? 1080),
    stripePort: Number(process.env.STRIPE_FAKE_PORT ?? 12111),
  };
  const env = stackEnv(options);
  const tsx = path.join("node_modules", ".bin", "tsx");

  if (mode === "production") {
    // The demo always starts from a fresh database.
    for (const file of ["steamlane.db", "steamlane.db-wal", "steamlane.db-shm"]) {
      fs.rmSync(path.join(options.dataDir, file), { force: true });
    }
    fs.rmSync(path.join(options.dataDir, "uploads"), { recursive: true, force: true });
    fs.rmSync(path.join(options.dataDir, "mail"), { recursive: true, force: true });
    await runToEnd(tsx, [SERVER_CONDITION, "db/seed/index.ts"], env);
    if (process.env.SKIP_BUILD !== "1") await runToEnd(path.join("node_modules", ".bin", "next"), ["build"], env);
  } else {
    await runToEnd(tsx, ["db/migrate.ts"], env);
  }

  const stack = await startStack(options);
  const shutdown = async () => {
    console.log("\nStopping Steamlane…");
    await stack.stop();
    process.exit(0);
  };
  process.on("SIGINT", shutdown);
  process.on("SIGTERM", shutdown);

  const width = Math.max(...DEMO_PEOPLE.map((p) => p.email.length));
  console.log(`
Steamlane is running at ${stack.appUrl}
Mail sent by the app arrives in the local inbox at ${stack.mailUrl}
Payments go to the local stand-in for Stripe at ${stack.stripeUrl}

Demo sign-ins (password for all: ${DEMO_PASSWORD}):
${DEMO_PEOPLE.map((p) => `  ${p.email.padEnd(width)}  ${ROLE_LABELS[p.role]}`).join("\n")}

Press Ctrl-C to stop.`);
}

main().catch((error) => {
  console.error(error instanceof Error ? error.message : error);
  process.exit(1);
});
