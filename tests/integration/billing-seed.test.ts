import fs from "node:fs";
import os from "node:os";
import path from "node:path";
import type { Kysely } from "kysely";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { openDatabase } from "@/db/connection";
import { migrateToLatest } from "@/db/migrator";
import type { Database } from "@/db/schema";
import { type SeedResult, seedDemo } from "@/db/seed/demo";
import { addMonths, billingPeriod, localDate, monthOf } from "@/lib/billing/run-periods";
import { type TestDatabase, useFreshDatabase } from "../support/db";

// The demo's invoices as seeded: paid, open, overdue and credited ones, and the two months it
// bills priced in full — whenever the demo is seeded, including just after a month has ended.

const ZONE = "Europe/London";
// Tuesday 1 December 2026, 00:30 in London (GMT): half an hour after November ended.
const now = new Date("2026-12-01T00:30:00Z");
let t: TestDatabase;
let seed: SeedResult;

beforeAll(async () => {
  t = await useFreshDatabase();
  seed = await seedDemo(t.db, now);
}, 180_000);
afterAll(() => t.cleanup());

/** Delivered cycles of the month with no priced_cycles row: what a run of the month would still bill. */
async function unbilled(db: Kysely<Database>, month: string) {
  const period = billingPeriod(month, ZONE);
  return db
    .selectFrom("cycles")
    .innerJoin("organisations", "organisations.id", "cycles.organisation_id")
    .leftJoin("priced_cycles", "priced_cycles.cycle_id", "cycles.id")
    .select(["cycles.id", "cycles.delivered_at", "organisations.short_code"])
    .where("cycles.state", "=", "delivered")
    .where("cycles.delivered_at", ">=", period.start)
    .where("cycles.delivered_at", "<", period.end)
    .where("priced_cycles.cycle_id", "is", null)
    .execute();
}

/** Every seeded month is billed in full, each run made after its month ended and issued before `at`. */
async function expectMonthsBilled(db: Kysely<Database>, at: Date) {
  const thisMonth = monthOf(at, ZONE);
  const months = [addMonths(thisMonth, -2), addMonths(thisMonth, -1)];
  const runs = await db.selectFrom("invoice_runs").selectAll().orderBy("period").execute();
  expect(runs.map((r) => [r.period, r.status])).toEqual(months.map((m) => [m, "issued"]));
  for (const run of runs) {
    expect(Date.parse(run.created_at)).toBeGreaterThanOrEqual(Date.parse(run.period_end));
    expect(Date.parse(run.issued_at!)).toBeLessThanOrEqual(at.getTime());
    expect(await unbilled(db, run.period), run.period).toEqual([]);
    // Every customer with deliveries in the month has its invoice.
    const delivered = await db
      .selectFrom("cycles")
      .select("organisation_id")
      .distinct()
      .where("state", "=", "delivered")
      .where("delivered_at", ">=", run.period_start)
      .where("delivered_at", "<", run.period_end)
      .execute();
    const invoiced = await db.selectFrom("invoices").select("organisation_id").where("run_id", "=", run.id).execute();
    expect(invoiced.map((i) => i.organisation_id).sort()).toEqual(delivered.map((d) => d.organisation_id).sort());
  }
}

describe("the demo's invoices", () => {
  it("has paid, open, overdue and credited invoices", async () => {
    const today = localDate(now, ZONE);
    const invoices = await t.db
      .selectFrom("invoices")
      .select(["id", "number", "status", "due_date", "total_minor", "amount_paid_minor", "amount_credited_minor", "amount_due_minor"])
      .orderBy("number")
      .execute();
    expect(invoices.length).toBeGreaterThanOrEqual(6);
    expect(invoices.filter((i) => i.status === "paid").length).toBeGreaterThanOrEqual(2);
    expect(invoices.filter((i) => i.status === "open" && i.due_date! >= today).length).toBeGreaterThanOrEqual(1);
    // The dental group's October invoice, on 14-day terms: due 15 November, unpaid on 1 December.
    const overdue = invoices.filter((i) => i.status === "open" && i.due_date! < today);
    expect(overdue.map((i) => [i.number, i.due_date])).toEqual([["LSS-2026-10-MDP", "2026-11-15"]]);
    const credited = invoices.filter((i) => i.amount_credited_minor > 0);
    expect(credited.map((i) => [i.number, i.status])).toEqual([["LSS-2026-10-QMH", "paid"]]);
  });

  it("credits one set of the hospital group's paid invoice through the credit-note code, settled outside the payment service", async () => {
    const invoiceId = seed.invoices!.invoices["LSS-2026-10-QMH"]!;
    const invoice = await t.db.selectFrom("invoices").selectAll().where("id", "=", invoiceId).executeTakeFirstOrThrow();
    const notes = await t.db.selectFrom("credit_notes").selectAll().where("invoice_id", "=", invoiceId).execute();
    expect(notes).toHaveLength(1);
    const note = notes[0]!;
    expect(note.number).toBe("LSS-CN-2026-10-QMH-1");
    expect(note.settlement).toBe("out_of_band");
    expect(note.stripe_credit_note_id).toBeNull();
    expect(note.created_by).toBe(seed.users["finance@larkmoor.example"]);
    expect(note.reason).toMatch(/contents list of another tray/);
    // After the payment (by transfer), before now.
    expect(Date.parse(note.created_at)).toBeGreaterThan(Date.parse(invoice.paid_at!));
    expect(Date.parse(note.created_at)).toBeLessThan(now.getTime());

    // One set of the first processing line: its unit price, VAT at the line's rate on the credit's
    // own taxable amount, rounded to a minor unit (EN 16931 BR-CO-17).
    const line = await t.db
      .selectFrom("invoice_lines")
      .selectAll()
      .where("invoice_id", "=", invoiceId)
      .where("kind", "=", "processing")
      .orderBy("position")
      .executeTakeFirstOrThrow();
    const lines = JSON.parse(note.lines) as { quantity: number; cycleIds?: string[] }[];
    expect(lines).toHaveLength(1);
    expect(lines[0]!.quantity).toBe(1);
    expect(lines[0]!.cycleIds).toEqual([String((JSON.parse(line.cycle_ids) as number[])[0])]);
    expect(note.net_minor).toBe(line.unit_price_minor);
    expect(note.vat_minor).toBe(Math.round((line.unit_price_minor * line.vat_rate_bp) / 10_000));
    expect(note.total_minor).toBe(note.net_minor + note.vat_minor);

    // The invoice stays paid, nothing due; the credit is on record and audited.
    expect([invoice.status, invoice.amount_paid_minor, invoice.amount_credited_minor, invoice.amount_due_minor]).toEqual([
      "paid",
      invoice.total_minor,
      note.total_minor,
      0,
    ]);
    const audit = await t.db.selectFrom("audit_log").selectAll().where("action", "=", "credit_note.created").where("entity_id", "=", String(invoiceId)).execute();
    expect(audit).toHaveLength(1);
    expect(JSON.parse(audit[0]!.details)).toMatchObject({ creditNote: note.number, settlement: "out_of_band", totalMinor: note.total_minor });
  });

  it("bills the two months before now in full when seeded half an hour after a month ended", async () => {
    await expectMonthsBilled(t.db, now);
  });

  // Just after midnight in summer time: 00:30 BST on 1 July is still 30 June in UTC.
  for (const other of ["2026-06-30T23:30:00Z"]) {
    it(`bills the two months before now in full when seeded at ${other}`, { timeout: 180_000 }, async () => {
      const dir = fs.mkdtempSync(path.join(os.tmpdir(), "steamlane-billing-seed-"));
      const db = openDatabase(path.join(dir, "steamlane.db"));
      try {
        await migrateToLatest(db);
        const at = new Date(other);
        await seedDemo(db, at);
        await expectMonthsBilled(db, at);
      } finally {
        await db.destroy();
        fs.rmSync(dir, { recursive: true, force: true });
      }
    });
  }
});
