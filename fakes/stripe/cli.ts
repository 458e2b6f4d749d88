import { parseArgs } from "node:util";
import { z } from "zod";
import { startFakeStripe } from "./server";

// Starts the fake Stripe server until SIGINT or SIGTERM:
//   tsx fakes/stripe/cli.ts [--port 12111] [--host 127.0.0.1] [--webhook-url URL] [--webhook-secret whsec_…]
//                           [--data-file data/fake-stripe.json] [--public-url URL] [--account-name NAME] [--currency eur]
// Each flag may come from the environment instead: STRIPE_FAKE_PORT, STRIPE_FAKE_HOST, STRIPE_WEBHOOK_URL,
// STRIPE_WEBHOOK_SECRET, STRIPE_FAKE_DATA_FILE, STRIPE_FAKE_PUBLIC_URL, STRIPE_FAKE_ACCOUNT_NAME, STRIPE_FAKE_CURRENCY.

const settingsSchema = z.object({
  port: z.coerce.number().int().min(0).max(65535).default(12111),
  host: z.string().min(1).default("127.0.0.1"),
  webhookUrl: z.string().url().optional(),
  webhookSecret: z.string().startsWith("whsec_", "a webhook secret starts with whsec_").optional(),
  dataFile: z.string().min(1).optional(),
  publicUrl: z.string().url().optional(),
  accountName: z.string().min(1).optional(),
  currency: z.string().regex(/^[A-Za-z]{3}$/, "a three-letter currency code").optional(),
});

async function main(): Promise<void> {
  const { values } = parseArgs({
    options: {
      port: { type: "string" },
      host: { type: "string" },
      "webhook-url": { type: "string" },
      "webhook-secret": { type: "string" },
      "data-file": { type: "string" },
      "public-url": { type: "string" },
      "account-name": { type: "string" },
      currency: { type: "string" },
    },
    strict: true,
  });
  const env = process.env;
  const parsed = settingsSchema.safeParse({
    port: values.port ?? env.STRIPE_FAKE_PORT,
    host: values.host ?? env.STRIPE_FAKE_HOST,
    webhookUrl: values["webhook-url"] ?? (env.STRIPE_WEBHOOK_URL || undefined),
    webhookSecret: values["webhook-secret"] ?? (env.STRIPE_WEBHOOK_SECRET || undefined),
    dataFile: values["data-file"] ?? (env.STRIPE_FAKE_DATA_FILE || undefined),
    publicUrl: values["public-url"] ?? (env.STRIPE_FAKE_PUBLIC_URL || undefined),
    accountName: values["account-name"] ?? (env.STRIPE_FAKE_ACCOUNT_NAME || undefined),
    currency: values.currency ?? (env.STRIPE_FAKE_CURRENCY || undefined),
  });
  if (!parsed.success) {
    const problems = parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ");
    throw new Error(`Bad fake Stripe settings: ${problems}`);
  }
  const s = parsed.data;
  const fake = await startFakeStripe({
    port: s.port,
    host: s.host,
    webhookUrl: s.webhookUrl,
    webhookSecret: s.webhookSecret,
    dataFile: s.dataFile,
    publicUrl: s.publicUrl,
    accountName: s.accountName,
    defaultCurrency: s.currency,
  });
  console.log(`fake stripe listening on ${fake.url} (API version ${fake.apiVersion})`);
  if (s.webhookUrl) console.log(`fake stripe: events go to ${s.webhookUrl}, signed with ${fake.webhookSecret}`);
  if (s.dataFile) console.log(`fake stripe: state kept in ${s.dataFile}`);

  let stopping = false;
  const stop = (signal: string) => {
    if (stopping) return;
    stopping = true;
    console.log(`fake stripe: ${signal}, stopping`);
    fake.close().then(
      () => process.exit(0),
      (e: unknown) => {
        console.error(e);
        process.exit(1);
      },
    );
  };
  process.on("SIGINT", () => stop("SIGINT"));
  process.on("SIGTERM", () => stop("SIGTERM"));
}

main().catch((e: unknown) => {
  console.error(e instanceof Error ? e.message : e);
  process.exit(1);
});
