import net from "node:net";
import { simpleParser } from "mailparser";
import nodemailer from "nodemailer";
import { SMTPServer } from "smtp-server";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { enqueueMail, processOutbox } from "@/lib/mail/outbox";
import { type TestDatabase, useFreshDatabase } from "../support/db";

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

/** A real SMTP server that records every message it accepts. */
async function startRelay(port: number) {
  const received: { messageId: string; to: string; subject: string; text: string; html: string }[] = [];
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ["STARTTLS"],
    onData(stream, _session, callback) {
      simpleParser(stream)
        .then((mail) => {
          received.push({
            messageId: mail.messageId ?? "",
            to: (Array.isArray(mail.to) ? mail.to[0] : mail.to)?.text ?? "",
            subject: mail.subject ?? "",
            text: mail.text ?? "",
            html: typeof mail.html === "string" ? mail.html : "",
          });
          callback();
        })
        .catch(callback);
    },
  });
  await new Promise<void>((resolve) => server.listen(port, "127.0.0.1", resolve));
  return { received, close: () => new Promise<void>((resolve) => server.close(() => resolve())) };
}

describe("the outbox against a real SMTP relay", () => {
  it("keeps every message while the relay is down and sends each exactly once when it is back", async () => {
    const port = await freePort();
    const transport = nodemailer.createTransport({ host: "127.0.0.1", port, secure: false, ignoreTLS: true, connectionTimeout: 2000 });
    let clock = new Date("2026-12-01T08:00:00Z");
    const now = () => clock;

    for (let i = 1; i <= 3; i++) {
      await enqueueMail(t.db, { template: "test", to: `person${i}@clinic.example`, subject: `Message ${i}`, text: `Body ${i}`, html: `<p>Body ${i}</p>` }, clock);
    }
    // Queuing the same notification twice (same key) keeps one message.
    const a = await enqueueMail(t.db, { template: "test", to: "dup@clinic.example", subject: "Once", text: "t", html: "h", dedupeKey: "k-1" }, clock);
    const b = await enqueueMail(t.db, { template: "test", to: "dup@clinic.example", subject: "Once", text: "t", html: "h", dedupeKey: "k-1" }, clock);
    expect(a).toBe(b);

    // Relay down: nothing is sent, nothing is lost, the next try waits (backoff).
    const down = await processOutbox(t.db, transport, { from: "test@steamlane.local", now });
    expect(down).toEqual({ sent: 0, failed: 1 });
    const pending = await t.db.selectFrom("outbox").selectAll().where("status", "=", "pending").execute();
    expect(pending).toHaveLength(4);
    const failed = pending.find((m) => m.attempts === 1)!;
    expect(failed.last_error).toBeTruthy();
    expect(failed.next_attempt_at > clock.toISOString()).toBe(true);

    // Relay back up, and time has moved past the backoff.
    const relay = await startRelay(port);
    try {
      clock = new Date("2026-12-01T08:05:00Z");
      const up = await processOutbox(t.db, transport, { from: "test@steamlane.local", now });
      expect(up).toEqual({ sent: 4, failed: 0 });
      // A second run finds nothing to send: no duplicates.
      expect(await processOutbox(t.db, transport, { from: "test@steamlane.local", now })).toEqual({ sent: 0, failed: 0 });

      expect(relay.received).toHaveLength(4);
      const rows = await t.db.selectFrom("outbox").selectAll().execute();
      expect(rows.every((r) => r.status === "sent" && r.sent_at)).toBe(true);
      expect(new Set(relay.received.map((m) => m.messageId))).toEqual(new Set(rows.map((r) => r.message_id)));
      expect(relay.received.map((m) => m.subject).sort()).toEqual(["Message 1", "Message 2", "Message 3", "Once"]);
      const first = relay.received.find((m) => m.subject === "Message 1")!;
      expect(first.text.trim()).toBe("Body 1");
      expect(first.html).toContain("<p>Body 1</p>");
    } finally {
      await relay.close();
      transport.close();
    }
  });

  it("takes over a message whose sender died mid-send once its claim has expired", async () => {
    const at = new Date("2026-12-02T08:00:00Z");
    const id = await enqueueMail(t.db, { template: "test", to: "late@clinic.example", subject: "Claimed", text: "t", html: "h" }, at);
    await t.db.updateTable("outbox").set({ status: "sending", locked_until: "2026-12-02T08:02:00.000Z", attempts: 1 }).where("id", "=", id).execute();
    const sent: string[] = [];
    const sender = { sendMail: async (m: { subject: string }) => void sent.push(m.subject) };
    expect(await processOutbox(t.db, sender, { from: "x@y.z", now: () => new Date("2026-12-02T08:01:00Z") })).toEqual({ sent: 0, failed: 0 });
    expect(await processOutbox(t.db, sender, { from: "x@y.z", now: () => new Date("2026-12-02T08:03:00Z") })).toEqual({ sent: 1, failed: 0 });
    expect(sent).toEqual(["Claimed"]);
  });
});
