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
  /** Where uploads live: "disk" (the uploads folder) or "s3" (a bucket of S3 or an S3-compatible service). */
  STORAGE_DRIVER: z.enum(["disk", "s3"]).default("disk"),
  S3_BUCKET: z.string().min(1).optional(),
  S3_REGION: z.string().min(1).optional(),
  /** Only for an S3-compatible service; without it the SDK talks to AWS in S3_REGION. */
  S3_ENDPOINT: z.string().regex(/^https?:\/\/[^\s/]+(\/\S*)?$/, "must be an http:// or https:// address, e.g. https://storage.example.net").optional(),
  S3_FORCE_PATH_STYLE: z.enum(["true", "false"]).default("false").transform((v) => v === "true"),
  /** Both or neither; without them the SDK's own chain (instance role, AWS_* variables) supplies credentials. */
  S3_ACCESS_KEY_ID: z.string().min(1).optional(),
  S3_SECRET_ACCESS_KEY: z.string().min(1).optional(),
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
}).superRefine((env, ctx) => {
  if (env.STORAGE_DRIVER !== "s3") return;
  const missing = (name: "S3_BUCKET" | "S3_REGION", what: string) =>
    ctx.addIssue({ code: "custom", path: [name], message: `required when STORAGE_DRIVER=s3: ${what}` });
  if (!env.S3_BUCKET) missing("S3_BUCKET", "the bucket that holds the uploads");
  if (!env.S3_REGION) missing("S3_REGION", "the bucket's region (any name the S3-compatible service accepts, e.g. us-east-1)");
  if (Boolean(env.S3_ACCESS_KEY_ID) !== Boolean(env.S3_SECRET_ACCESS_KEY)) {
    const absent = env.S3_ACCESS_KEY_ID ? "S3_SECRET_ACCESS_KEY" : "S3_ACCESS_KEY_ID";
    ctx.addIssue({ code: "custom", path: [absent], message: "set S3_ACCESS_KEY_ID and S3_SECRET_ACCESS_KEY together, or neither" });
  }
});

/** Where uploads are kept, from STORAGE_DRIVER and the S3_* settings. */
export type StorageSettings =
  | { driver: "disk"; dir: string }
  | {
      driver: "s3";
      bucket: string;
      region: string;
      endpoint?: string;
      forcePathStyle: boolean;
      credentials?: { accessKeyId: string; secretAccessKey: string };
    };

export type ServerEnv = z.infer<typeof serverEnvSchema> & {
  databasePath: string;
  uploadsDir: string;
  storage: StorageSettings;
};

let cached: ServerEnv | undefined;

/** The parsed environment; throws with the list of bad variables when one is wrong. */
export function serverEnv(): ServerEnv {
  cached ??= parseServerEnv(process.env);
  return cached;
}

/** Parses the given variables as `serverEnv` does, without caching (scripts handed an environment). */
export function parseServerEnv(source: Record<string, string | undefined>): ServerEnv {
  const parsed = serverEnvSchema.safeParse(source);
  if (!parsed.success) {
    const problems = parsed.error.issues.map((i) => `${i.path.join(".")}: ${i.message}`).join("; ");
    throw new Error(`Bad environment configuration: ${problems}`);
  }
  const env = parsed.data;
  const uploadsDir = env.UPLOADS_DIR ?? path.join(env.STEAMLANE_DATA_DIR, "uploads");
  return {
    ...env,
    databasePath: env.DATABASE_PATH ?? path.join(env.STEAMLANE_DATA_DIR, "steamlane.db"),
    uploadsDir,
    storage:
      env.STORAGE_DRIVER === "s3"
        ? {
            driver: "s3",
            bucket: env.S3_BUCKET!,
            region: env.S3_REGION!,
            endpoint: env.S3_ENDPOINT,
            forcePathStyle: env.S3_FORCE_PATH_STYLE,
            credentials:
              env.S3_ACCESS_KEY_ID && env.S3_SECRET_ACCESS_KEY
                ? { accessKeyId: env.S3_ACCESS_KEY_ID, secretAccessKey: env.S3_SECRET_ACCESS_KEY }
                : undefined,
          }
        : { driver: "disk", dir: uploadsDir },
  };
}

/** Forget the parsed environment (tests change variables between files). */
export function resetServerEnvCache(): void {
  cached = undefined;
}
