// Runs every pending migration in migrations/ against DATABASE_PATH (or data/steamlane.db).
// Exits non-zero and names the failing migration when one fails.
import { migrateToLatest } from "./migrator";
import { openDatabase } from "./connection";
import { serverEnv } from "@/lib/env";

async function main() {
  const file = serverEnv().databasePath;
  const db = openDatabase(file);
  try {
    const applied = await migrateToLatest(db);
    console.log(applied.length ? `Applied ${applied.join(", ")} to ${file}` : `${file} is up to date`);
  } finally {
    await db.destroy();
  }
}

main().catch((error) => {
  console.error(error instanceof Error ? error.message : error);
  process.exit(1);
});
