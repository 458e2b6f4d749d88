import { randomBytes } from "node:crypto";
import fs from "node:fs";
import path from "node:path";
import { type Child, SERVER_CONDITION, startChild, waitForHttp } from "./processes";

// The whole local stack: the Next.js server, the outbox worker and the local stand-ins for the
// hosted services (the maildev SMTP catcher and the fake Stripe server). Used by `npm run demo`, `npm run dev` and the
// end-to-end tests.

export interface StackOptions {
  mode: "production" | "development";
  dataDir: string;
  port: number;
  mailSmtpPort: number;
  mailWebPort: number;
  stripePort: number;
  quiet?: boolean;
}

export interface Stack {
  appUrl: string;
  mailUrl: string;
  stripeUrl: string;
  env: Record<string, string>;
  stop(): Promise<void>;
}

const bin = (name: string) => path.join(process.cwd(), "node_modules", ".bin", name);

/** A secret kept in the data folder, so sessions survive a restart of the same stack. */
function persistentSecret(dataDir: string): string {
  const file = path.join(dataDir, ".nextauth-secret");
  if (fs.existsSync(file)) return fs.readFileSync(file, "utf8").trim();
  const secret = randomBytes(32).toString("base64url");
  fs.writeFileSync(file, secret, { mode: 0o600 });
  return secret;
}

/** The environment every process of the stack shares. */
export function stackEnv(options: StackOptions): Record<string, string> {
  fs.mkdirSync(options.dataDir, { recursive: true });
  const appUrl = `http://localhost:${options.port}`;
  return {
    STEAMLANE_DATA_DIR: options.dataDir,
    APP_URL: appUrl,
    NEXTAUTH_URL: appUrl,
    NEXTAUTH_SECRET: process.env.NEXTAUTH_SECRET ?? persistentSecret(options.dataDir),
    SMTP_HOST: "127.0.0.1",
    SMTP_PORT: String(options.mailSmtpPort),
    // The Stripe SDK talks to the local fake; the key and webhook secret are the fake's own.
    STRIPE_SECRET_KEY: "sk_test_steamlane_local",
    STRIPE_WEBHOOK_SECRET: "whsec_steamlane_local_webhook_secret",
    STRIPE_API_HOST: "127.0.0.1",
    STRIPE_API_PORT: String(options.stripePort),
    STRIPE_API_PROTOCOL: "http",
    NEXT_TELEMETRY_DISABLED: "1",
  };
}

export async function startStack(options: StackOptions): Promise<Stack> {
  const env = stackEnv(options);
  const children: Child[] = [];
  const stop = async () => {
    await Promise.all(children.reverse().map((c) => c.stop()));
  };
  try {
    const mailDir = path.join(options.dataDir, "mail");
    fs.mkdirSync(mailDir, { recursive: true });
    const maildev = startChild(
      "mail",
      bin("maildev"),
      [
        "--ip", "127.0.0.1",
        "--web-ip", "127.0.0.1",
        "-s", String(options.mailSmtpPort),
        "-w", String(options.mailWebPort),
        "--mail-directory", mailDir,
      ],
      { quiet: true },
    );
    children.push(maildev);
    const mailUrl = `http://127.0.0.1:${options.mailWebPort}`;
    await waitForHttp(`${mailUrl}/api/healthz`, 30_000, maildev);

    const stripeUrl = `http://127.0.0.1:${options.stripePort}`;
    const stripe = startChild("payments", bin("tsx"), ["fakes/stripe/cli.ts"], {
      env: {
        ...env,
        STRIPE_FAKE_PORT: String(options.stripePort),
        STRIPE_FAKE_DATA_FILE: path.join(options.dataDir, "fake-stripe.json"),
        STRIPE_FAKE_PUBLIC_URL: stripeUrl,
        STRIPE_WEBHOOK_URL: `${env.APP_URL}/api/webhooks/stripe`,
        STRIPE_FAKE_CURRENCY: "gbp",
        STRIPE_FAKE_ACCOUNT_NAME: "Larkmoor Sterile Services",
      },
      quiet: options.quiet,
    });
    children.push(stripe);
    await waitForHttp(`${stripeUrl}/_fake/health`, 30_000, stripe);

    children.push(startChild("outbox", bin("tsx"), [SERVER_CONDITION, "lib/mail/worker-cli.ts"], { env, quiet: options.quiet }));

    const next = startChild(
      "app",
      bin("next"),
      [options.mode === "production" ? "start" : "dev", "-p", String(options.port), "-H", "127.0.0.1"],
      { env: { ...env, NODE_ENV: options.mode }, quiet: options.quiet },
    );
    children.push(next);
    const appUrl = env.APP_URL;
    await waitForHttp(`http://127.0.0.1:${options.port}/sign-in`, 120_000, next);
    return { appUrl, mailUrl, stripeUrl, env, stop };
  } catch (error) {
    await stop();
    throw error;
  }
}
