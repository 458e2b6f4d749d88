import net from "node:net";
import { simpleParser } from "mailparser";
import nodemailer, { type Transporter } from "nodemailer";
import { SMTPServer, type SMTPServerOptions } from "smtp-server";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { enqueueMail, processOutbox } from "@/lib/mail/outbox";
import { type TestDatabase, useFreshDatabase } from "../support/db";

// The outbox against an SMTP relay that is slow or failing (the relay stopped altogether is in
// outbox.test.ts): nothing lost, nothing sent twice, and every message out once the relay is well.

let t: TestDatabase;
beforeAll(async () => {
  t = await useFreshDatabase();
});
afterAll(() => t.cleanup());

async function freePort(): Promise<number> {
  return new Promise((resolve) => {
    const srv = net.createServer().listen(0, "127.0.0.1", () => {
      const { port } = srv.address() as net.AddressInfo;
      srv.close(() => resolve(port));
    });
  });
}

interface RelayBehaviour {
  /** Milliseconds to wait before greeting a connection. */
  greetingDelayMs?: number;
  /** Answer the DATA of the next n messages with this SMTP error instead of accepting them. */
  reject?: { count: number; code: number; message: string };
}

/** A real SMTP server whose behaviour the test changes while it runs; it records what it accepted. */
async function startRelay(port: number, behaviour: RelayBehaviour) {
  const accepted: { messageId: string; subject: string }[] = [];
  let refusals = 0;
  const options: SMTPServerOptions = {
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    onConnect(_session, callback) {
      if (behaviour.greetingDelayMs) setTimeout(() => callback(), behaviour.greetingDelayMs);
      else callback();
    },
    onData(stream, _session, callback) {
      simpleParser(stream)
        .then((mail) => {
          if (behaviour.reject && behaviour.reject.count > 0) {
            behaviour.reject.count--;
            refusals++;
            const error = new Error(behaviour.reject.message) as Error & { responseCode: number };
            error.responseCode = behaviour.reject.code;
            return callback(error);
          }
          accepted.push({ messageId: mail.messageId ?? "", subject: mail.subject ?? "" });
          callback();
        })
        .catch(callback);
    },
  };
  const server = new SMTPServer(options);
  server.on("error", () => {});
  await new Promise<void>((resolve) => server.listen(port, "127.0.0.1", resolve));
  return { accepted, refusals: () => refusals, close: () => new Promise<void>((resolve) => server.close(() => resolve())) };
}

async function queue(prefix: string, n: number, at: Date) {
  for (let i = 1; i <= n; i++) {
    await enqueueMail(t.db, { template: "test", to: `${prefix}${i}@clinic.example`, subject: `${prefix} ${i}`, text: `Body ${i}`, html: `<p>Body ${i}</p>` }, at);
  }
}

/** Runs the worker until nothing is due, moving the clock past each backoff. */
async function drain(sender: Transporter, start: Date, rounds = 20) {
  let clock = start;
  let sent = 0;
  let failed = 0;
  for (let i = 0; i < rounds; i++) {
    const r = await processOutbox(t.db, sender, { from: "test@steamlane.local", now: () => clock });
    sent += r.sent;
    failed += r.failed;
    const due = await t.db.selectFrom("outbox").select("id").where("status", "!=", "sent").executeTakeFirst();
    if (!due) break;
    clock = new Date(clock.getTime() + 31 * 60_000);
  }
  return { sent, failed };
}

async function expectSentOnce(prefix: string, n: number, accepted: { messageId: string; subject: string }[]) {
  const rows = await t.db.selectFrom("outbox").selectAll().where("subject", "like", `${prefix} %`).execute();
  expect(rows).toHaveLength(n);
  expect(rows.every((r) => r.status === "sent")).toBe(true);
  const mine = accepted.filter((m) => m.subject.startsWith(`${prefix} `));
  expect(mine).toHaveLength(n);
  expect(new Set(mine.map((m) => m.messageId))).toEqual(new Set(rows.map((r) => r.message_id)));
}

describe("the outbox while the relay is failing", () => {
  it("keeps messages the relay refused with 451 and 554, and sends each once when it accepts again", async () => {
    const port = await freePort();
    const behaviour: RelayBehaviour = { reject: { count: 3, code: 451, message: "Requested action aborted: local error in processing" } };
    const relay = await startRelay(port, behaviour);
    const transport = nodemailer.createTransport({ host: "127.0.0.1", port, secure: false, ignoreTLS: true, connectionTimeout: 2000, socketTimeout: 5000 });
    try {
      const start = new Date("2026-12-03T08:00:00Z");
      await queue("Refused", 4, start);
      const firstRun = await processOutbox(t.db, transport, { from: "test@steamlane.local", now: () => start });
      expect(firstRun).toEqual({ sent: 0, failed: 1 });
      const refused = await t.db.selectFrom("outbox").selectAll().where("subject", "like", "Refused %").where("attempts", "=", 1).executeTakeFirstOrThrow();
      expect(refused.status).toBe("pending");
      expect(refused.last_error).toMatch(/451/);
      // A permanent-looking refusal is retried too: the relay decides, the message is never dropped.
      behaviour.reject = { count: 1, code: 554, message: "Transaction failed" };
      const result = await drain(transport, new Date(start.getTime() + 60_000));
      expect(result.failed).toBeGreaterThanOrEqual(1);
      await expectSentOnce("Refused", 4, relay.accepted);
      expect(relay.refusals()).toBeGreaterThanOrEqual(2);
      expect(await processOutbox(t.db, transport, { from: "test@steamlane.local", now: () => new Date("2026-12-04T08:00:00Z") })).toEqual({ sent: 0, failed: 0 });
    } finally {
      transport.close();
      await relay.close();
    }
  });
});

describe("the outbox while the relay is slow", () => {
  it("gives up on a relay slower than the transport's timeouts without losing anything, and sends once when it is quick again", async () => {
    const port = await freePort();
    const behaviour: RelayBehaviour = { greetingDelayMs: 1500 };
    const relay = await startRelay(port, behaviour);
    const impatient = nodemailer.createTransport({ host: "127.0.0.1", port, secure: false, ignoreTLS: true, connectionTimeout: 500, greetingTimeout: 500, socketTimeout: 1000 });
    try {
      const start = new Date("2026-12-05T08:00:00Z");
      await queue("Slow", 3, start);
      expect(await processOutbox(t.db, impatient, { from: "test@steamlane.local", now: () => start })).toEqual({ sent: 0, failed: 1 });
      const pending = await t.db.selectFrom("outbox").selectAll().where("subject", "like", "Slow %").execute();
      expect(pending.every((m) => m.status === "pending")).toBe(true);
      expect(pending.find((m) => m.attempts === 1)?.last_error).toMatch(/timeout|greeting/i);
      expect(relay.accepted.filter((m) => m.subject.startsWith("Slow "))).toHaveLength(0);

      // Slow but within the timeouts: every message goes, each once.
      behaviour.greetingDelayMs = 300;
      const result = await drain(impatient, new Date(start.getTime() + 60_000));
      expect(result.sent).toBe(3);
      await expectSentOnce("Slow", 3, relay.accepted);
    } finally {
      impatient.close();
      await relay.close();
    }
  });
});
