// Seeds the demo scenario into the configured database, DATABASE_URL or DATABASE_PATH (migrating it first).
import { describeConfigured, openConfigured } from "../connection";
import { migrateToLatest } from "../migrator";
import { serverEnv } from "@/lib/env";
import { seedDemo } from "./demo";

async function main() {
  const file = describeConfigured(serverEnv());
  const db = openConfigured(serverEnv());
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
