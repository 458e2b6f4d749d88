// The outbox worker as its own process (started by `npm run demo` / `npm run dev`, or
// `npm run mail:worker`): sends queued e-mail through the SMTP relay until stopped.
import { openDatabase } from "@/db/connection";
import { serverEnv } from "@/lib/env";
import { startOutboxWorker } from "./worker";

const db = openDatabase(serverEnv().databasePath);
const stop = startOutboxWorker(db, Number(process.env.OUTBOX_INTERVAL_MS ?? 1000), { keepAlive: true });
console.log(`outbox worker: sending through ${serverEnv().SMTP_HOST}:${serverEnv().SMTP_PORT}`);

for (const signal of ["SIGINT", "SIGTERM"] as const) {
  process.on(signal, async () => {
    stop();
    await db.destroy();
    process.exit(0);
  });
}
