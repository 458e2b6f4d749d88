// The outbox worker as its own process (started by `npm run demo` / `npm run dev`, or
// `npm run mail:worker`): sends queued e-mail through the SMTP relay until stopped, and runs the
// scheduled jobs (lib/jobs) that fall due, checking every minute.
import { openConfigured } from "@/db/connection";
import { serverEnv } from "@/lib/env";
import { startJobScheduler } from "@/lib/jobs/scheduler";
import { startOutboxWorker } from "./worker";

const db = openConfigured(serverEnv());
const stop = startOutboxWorker(db, Number(process.env.OUTBOX_INTERVAL_MS ?? 1000), { keepAlive: true });
const stopJobs = startJobScheduler(db, 60_000);
console.log(`outbox worker: sending through ${serverEnv().SMTP_HOST}:${serverEnv().SMTP_PORT}`);

for (const signal of ["SIGINT", "SIGTERM"] as const) {
  process.on(signal, async () => {
    stop();
    stopJobs();
    await db.destroy();
    process.exit(0);
  });
}
