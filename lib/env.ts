import path from "node:path";
import { z } from "zod";

// Server-side configuration, parsed once from the environment. Client code never imports this.
const serverEnvSchema = z.object({
  NODE_ENV: z.enum(["development", "test", "production"]).default("development"),
  /** Folder for the SQLite file and uploads; git-ignored. */
  STEAMLANE_DATA_DIR: z.string().min(1).default("data"),
  DATABASE_PATH: z.string().min(1).optional(),
  /** A postgres:// address selects PostgreSQL instead of the SQLite file. */
  DATABASE_URL: z
    .string()
    .regex(/^postgres(ql)?:\/\/\S+$/, "must be a postgres:// or postgresql:// address")
    .optional(),
  UPLOADS_DIR: z.string().min(1).optional(),
  /** Public address of the app, used in e-mailed links. */
  APP_URL: z.string().url().default("http://localhost:3000"),
  NEXTAUTH_SECRET: z.string().min(16).optional(),
  SMTP_HOST: z.string().min(1).default("127.0.0.1"),
  SMTP_PORT: z.coerce.number().int().positive().default(1025),
  SMTP_SECURE: z
    .enum(["true", "false"])
    .default("false")
    .transform((v) => v === "true"),
  SMTP_USER: z.string().optional(),
  SMTP_PASSWORD: z.string().optional(),
  MAIL_FROM: z.string().min(3).default("Steamlane <no-reply@larkmoor.example>"),
  /** "off" stops the in-process outbox worker (tests drive the outbox themselves). */
  MAIL_WORKER: z.enum(["on", "off"]).default("on"),
  /** The payment service: Stripe's API through the `stripe` SDK (the local fake in development). */
  STRIPE_SECRET_KEY: z.string().startsWith("sk_").optional(),
  STRIPE_WEBHOOK_SECRET: z.string().startsWith("whsec_").optional(),
  /** Set only to point the SDK at another host, as the local fake does. */
  STRIPE_API_HOST: z.string().min(1).optional(),
  STRIPE_API_PORT: z.coerce.number().int().positive().optional(),
  STRIPE_API_PROTOCOL: z.enum(["http", "https"]).optional(),
  /** The unit's own time zone: service calendars, dates on labels and invoices. */
  UNIT_TIME_ZONE: z.string().min(1).default("Europe/London"),
  /**
   * The GS1 Company Prefix new sets' GIAIs start with: the one the unit's GS1 member organisation
   * allocated to it. The default is a number under GS1 Prefix 952, which GS1 keeps for
   * demonstrations and examples. Sets keep the GIAI they were given.
   */
  GS1_COMPANY_PREFIX: z
    .string()
    .regex(/^\d{4,12}$/, "must be the unit's GS1 Company Prefix: 4 to 12 digits")
    .default("9521234"),
});

export type ServerEnv = z.infer<typeof serverEnvSchema> & {
  databasePath: string;
  uploadsDir: string;
};

let cached: ServerEnv | undefined;

/** The parsed environment; throws with the list of bad variables when one is wrong. */
export function serverEnv(): ServerEnv {
  if (cached) return cached;
  const parsed = serverEnvSchema.safeParse(process.env);
  if (!parsed.success) {
    const problems = parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ");
    throw new Error(`Bad environment configuration: ${problems}`);
  }
  const env = parsed.data;
  cached = {
    ...env,
    databasePath: env.DATABASE_PATH ?? path.join(env.STEAMLANE_DATA_DIR, "steamlane.db"),
    uploadsDir: env.UPLOADS_DIR ?? path.join(env.STEAMLANE_DATA_DIR, "uploads"),
  };
  return cached;
}

/** Forget the parsed environment (tests change variables between files). */
export function resetServerEnvCache(): void {
  cached = undefined;
}
