// A child process that runs one real operation on the database of STEAMLANE_DATA_DIR and, when
// CRASH_PAUSE_AFTER=N is set, stops dead after the N-th SQL statement has run (inside whatever
// transaction is open then) and says so on stdout, so that the test can SIGKILL it there.
//
//   tsx --conditions=react-server tests/support/crash-worker.ts close-batch '{"batchId":…}'
//   tsx --conditions=react-server tests/support/crash-worker.ts issue-run '{"runId":…}'
//
// Prints "paused <n>" at the pause, or "done <statements>" when the operation finished.
import type { KyselyPlugin, PluginTransformQueryArgs, PluginTransformResultArgs, QueryResult, RootOperationNode, UnknownRow } from "kysely";
import { closeDb, getDb } from "@/db";
import { loadSessionUser } from "@/lib/auth/session-user";
import { issueRun } from "@/lib/billing/run-issue";
import { closeBatch } from "@/lib/washing/service";

const pauseAfter = process.env.CRASH_PAUSE_AFTER ? Number(process.env.CRASH_PAUSE_AFTER) : Number.POSITIVE_INFINITY;

/** Counts statements; at the chosen one, keeps the process alive but never lets it go on. */
class PauseAfterStatements implements KyselyPlugin {
  count = 0;
  transformQuery(args: PluginTransformQueryArgs): RootOperationNode {
    return args.node;
  }
  async transformResult(args: PluginTransformResultArgs): Promise<QueryResult<UnknownRow>> {
    this.count += 1;
    if (this.count === pauseAfter) {
      process.stdout.write(`paused ${this.count}\n`);
      setInterval(() => {}, 1 << 30);
      await new Promise(() => {});
    }
    return args.result;
  }
}

async function main() {
  const [op, json] = process.argv.slice(2);
  const input = JSON.parse(json ?? "{}") as Record<string, unknown>;
  const counter = new PauseAfterStatements();
  const db = getDb().withPlugin(counter);
  const user = await loadSessionUser(getDb(), { userId: Number(input.userId), sessionVersion: 0 });
  if (!user) throw new Error(`user ${String(input.userId)} cannot act`);
  const now = new Date(String(input.now));
  if (op === "close-batch") {
    await closeBatch(db, user, Number(input.batchId), { record: input.record as never, clientEventId: String(input.clientEventId) }, now);
  } else if (op === "issue-run") {
    const result = await issueRun(db, user, Number(input.runId), { now: () => now });
    process.stdout.write(`issued ${JSON.stringify(result)}\n`);
  } else {
    throw new Error(`unknown operation ${op}`);
  }
  process.stdout.write(`done ${counter.count}\n`);
  await closeDb();
}

main().catch((error: unknown) => {
  process.stderr.write(`${error instanceof Error ? (error.stack ?? error.message) : String(error)}\n`);
  process.exit(1);
});
