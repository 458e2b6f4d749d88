// Seeds the demo scenario into the database at DATABASE_PATH (migrating it first).
import { openDatabase } from "../connection";
import { migrateToLatest } from "../migrator";
import { serverEnv } from "@/lib/env";
import { seedDemo } from "./demo";

async function main() {
  const file = serverEnv().databasePath;
  const db = openDatabase(file);
  try {
    await migrateToLatest(db);
    const result = await seedDemo(db);
    console.log(
      `Seeded ${file}: ${Object.keys(result.organisations).length} organisations, ` +
        `${Object.keys(result.sites).length} sites, ${Object.keys(result.users).length} users.`,
    );
  } finally {
    await db.destroy();
  }
}

main().catch((error) => {
  console.error(error instanceof Error ? error.message : error);
  process.exit(1);
});
