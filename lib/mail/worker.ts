import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import { serverEnv } from "@/lib/env";
import { processOutbox } from "./outbox";
import { createMailTransport } from "./transport";

// The outbox worker: every interval, sends what is due. One per process at most.

const globalForWorker = globalThis as unknown as { steamlaneOutboxTimer?: NodeJS.Timeout };

export function startOutboxWorker(
  db: Kysely<Database>,
  intervalMs = 2000,
  options: { keepAlive?: boolean } = {},
): () => void {
  if (globalForWorker.steamlaneOutboxTimer) return () => {};
  const transport = createMailTransport();
  const from = serverEnv().MAIL_FROM;
  let running = false;
  const tick = async () => {
    if (running) return;
    running = true;
    try {
      await processOutbox(db, transport, { from });
    } catch (error) {
      console.error("outbox worker:", error);
    } finally {
      running = false;
    }
  };
  const timer = setInterval(tick, intervalMs);
  if (!options.keepAlive) timer.unref();
  globalForWorker.steamlaneOutboxTimer = timer;
  return () => {
    clearInterval(timer);
    globalForWorker.steamlaneOutboxTimer = undefined;
  };
}
