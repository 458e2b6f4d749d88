// Runs every pending migration in migrations/ against the configured database: DATABASE_URL
// (PostgreSQL) when set, else DATABASE_PATH (or data/steamlane.db).
// Exits non-zero and names the failing migration when one fails.
import { migrateToLatest } from "./migrator";
import { describeConfigured, openConfigured } from "./connection";
import { serverEnv } from "@/lib/env";

async function main() {
  const env = serverEnv();
  const target = describeConfigured(env);
  const db = openConfigured(env);
  try {
    const applied = await migrateToLatest(db);
    console.log(applied.length ? `Applied ${applied.join(", ")} to ${target}` : `${target} is up to date`);
  } finally {
    await db.destroy();
  }
}

main().catch((error) => {
  console.error(error instanceof Error ? error.message : error);
  process.exit(1);
});
