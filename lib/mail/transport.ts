import nodemailer from "nodemailer";
import { serverEnv } from "@/lib/env";

/** The nodemailer transport for the configured SMTP relay. */
export function createMailTransport() {
  const env = serverEnv();
  return nodemailer.createTransport({
    host: env.SMTP_HOST,
    port: env.SMTP_PORT,
    secure: env.SMTP_SECURE,
    auth: env.SMTP_USER ? { user: env.SMTP_USER, pass: env.SMTP_PASSWORD ?? "" } : undefined,
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 20_000,
  });
}
