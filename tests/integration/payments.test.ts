import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { GET as creditNoteXmlRoute } from "@/app/api/billing/invoices/[id]/credit-notes/[creditNoteId]/credit-note.xml/route";
import { GET as invoicePdfRoute } from "@/app/api/billing/invoices/[id]/invoice.pdf/route";
import { GET as invoiceXmlRoute } from "@/app/api/billing/invoices/[id]/invoice.xml/route";
import { GET as invoiceRoute } from "@/app/api/billing/invoices/[id]/route";
import { GET as headersCsvRoute } from "@/app/api/billing/invoices/headers.csv/route";
import { GET as listRoute } from "@/app/api/billing/invoices/route";
import { GET as summaryRoute } from "@/app/api/billing/invoices/summary/route";
import type { SeedResult } from "@/db/seed/demo";
import type { FakeStripe } from "@/fakes/stripe/server";
import { createCreditNote } from "@/lib/billing/credit-notes";
import { ageBucketOf, getInvoiceDetail, type InvoiceListRow } from "@/lib/billing/invoices";
import { closeInvoice, ensureStripeInvoice, startOnlinePayment } from "@/lib/billing/payments";
import { dailyPeriod, invoiceRemindersJob, reminderSchedule, ruleReached, sendDueReminders, setReminderSchedule } from "@/lib/billing/reminders";
import { runDueJobs } from "@/lib/jobs/scheduler";
import { AppError } from "@/lib/errors";
import { stripeClient } from "@/lib/stripe";
import { countRows } from "../support/db";
import { type DemoDatabase, useDemoDatabase } from "../support/demo-database";
import { startPaymentService, type TestPaymentService } from "../support/payment-service";
import { params, requestAs, sessionUser } from "../support/session";

// Paying online, credit notes, closing invoices and reminders against the seeded demo, with the
// real SDK talking to the local fake of the payment service; and the tenant scope of every
// invoice route.

const SECRET = "whsec_test_steamlane_payments_0123456789";
const SEEDED_AT = new Date("2026-12-01T08:00:00Z");
const TABLES = ["invoices", "credit_notes", "payments", "outbox", "audit_log"] as const;

let t: DemoDatabase;
let seed: SeedResult;
let fake: FakeStripe;
let payments: TestPaymentService;

const invoiceId = (number: string) => {
  const id = seed.invoices?.invoices[number];
  if (!id) throw new Error(`the demo has no invoice ${number}`);
  return id;
};
const invoiceRow = (id: number) => t.db.selectFrom("invoices").selectAll().where("id", "=", id).executeTakeFirstOrThrow();
const user = (email: string) => sessionUser(t.db, seed.users[email]!);
const FINANCE = "finance@larkmoor.example";
const QMH_MANAGER = "manager@quillby.example";
const ODS_MANAGER = "manager@otterwick.example";
const MDP_MANAGER = "manager@marrowgate.example";

async function refused(promise: Promise<unknown>, pattern: RegExp): Promise<AppError> {
  const error = await promise.then(
    () => null,
    (e: unknown) => e,
  );
  expect(error).toBeInstanceOf(AppError);
  expect((error as AppError).message).toMatch(pattern);
  return error as AppError;
}

const payByCard = async (stripeInvoiceId: string, number: string) => {
  const res = await fetch(`${fake.url}/_fake/invoices/${stripeInvoiceId}/pay`, {
    method: "POST",
    headers: { "content-type": "application/json" },
    body: JSON.stringify({ number, exp_month: 12, exp_year: 2034, cvc: "123" }),
  });
  await fake.webhooksIdle();
  return res.status;
};

beforeAll(async () => {
  t = await useDemoDatabase(SEEDED_AT);
  seed = t.seed;
  payments = await startPaymentService({ secretKey: "sk_test_steamlane_payments", webhookSecret: SECRET });
  fake = payments.fake;
});

afterAll(async () => {
  await payments?.stop();
  await t.cleanup();
});

describe("paying online", () => {
  it("makes the payment service's copy on demand, once, with our total, and opens its payment page", async () => {
    const id = invoiceId("LSS-2026-11-QMH");
    const manager = await user(QMH_MANAGER);
    const first = await startOnlinePayment(t.db, manager, id);
    expect(first.url).toMatch(new RegExp(`^${fake.url}/hosted/invoices/in_`));
    const again = await startOnlinePayment(t.db, manager, id);
    expect(again.url).toBe(first.url);

    const row = await invoiceRow(id);
    const remote = await stripeClient().invoices.retrieve(row.stripe_invoice_id!);
    expect(remote.status).toBe("open");
    expect(remote.total).toBe(row.total_minor);
    expect(remote.amount_due).toBe(row.amount_due_minor);
    expect(remote.currency).toBe("gbp");
    expect(remote.metadata?.steamlane_invoice_id).toBe(String(id));
    // One item per line and one for VAT, none twice.
    const lines = await t.db.selectFrom("invoice_lines").select(["stripe_invoice_item_id"]).where("invoice_id", "=", id).execute();
    const remoteLines = await stripeClient().invoices.listLineItems(remote.id!, { limit: 100 }).autoPagingToArray({ limit: 1000 });
    expect(remoteLines).toHaveLength(lines.length + 1);
    expect(lines.every((l) => l.stripe_invoice_item_id?.startsWith("ii_"))).toBe(true);
    const customers = await stripeClient().customers.list({ limit: 100 }).autoPagingToArray({ limit: 100 });
    expect(customers.filter((c) => c.metadata?.steamlane_organisation_id === String(seed.organisations.QMH))).toHaveLength(1);

    // Making it again finds what is there: no second invoice, item or customer.
    const creates = (await (await fetch(`${fake.url}/_fake/requests?method=POST&path=/v1/invoice`)).json()) as { data: unknown[] };
    await ensureStripeInvoice(t.db, id);
    const after = (await (await fetch(`${fake.url}/_fake/requests?method=POST&path=/v1/invoice`)).json()) as { data: unknown[] };
    expect(after.data.length).toBe(creates.data.length);
  });

  it("refuses another organisation's invoice as not found, and paid or void invoices with a reason", async () => {
    const other = await user(ODS_MANAGER);
    const error = await refused(startOnlinePayment(t.db, other, invoiceId("LSS-2026-11-QMH")), /not found/);
    expect(error.code).toBe("not_found");
    await refused(startOnlinePayment(t.db, await user(QMH_MANAGER), invoiceId("LSS-2026-10-QMH")), /already paid/);
  });

  it("pays with the success card; the webhook marks it paid and the detail shows the payment", async () => {
    const id = invoiceId("LSS-2026-11-QMH");
    const row = await invoiceRow(id);
    expect(await payByCard(row.stripe_invoice_id!, "4242424242424242")).toBe(200);
    const detail = await getInvoiceDetail(t.db, await user(QMH_MANAGER), id);
    expect(detail.status).toBe("paid");
    expect(detail.amountDueMinor).toBe(0);
    expect(detail.payments).toHaveLength(1);
    expect(detail.payments[0]!.amountMinor).toBe(row.total_minor);
  });

  it("leaves the invoice open after a declined card and says why", async () => {
    const id = invoiceId("LSS-2026-11-ODS");
    const { url } = await startOnlinePayment(t.db, await user(ODS_MANAGER), id);
    expect(url).toContain("/hosted/invoices/");
    const row = await invoiceRow(id);
    expect(await payByCard(row.stripe_invoice_id!, "4000000000000002")).toBe(402);
    const detail = await getInvoiceDetail(t.db, await user(ODS_MANAGER), id);
    expect(detail.status).toBe("open");
    expect(detail.lastPaymentError).toMatch(/Your card was declined/);
    expect(detail.amountDueMinor).toBe(row.total_minor);
  });
});

describe("the invoice's evidence", () => {
  it("lists for each line the sets it was priced from, delivered in the period, with the late ones marked", async () => {
    const detail = await getInvoiceDetail(t.db, await user(FINANCE), invoiceId("LSS-2026-10-QMH"));
    const processing = detail.lines.filter((l) => l.kind === "processing");
    expect(processing.length).toBeGreaterThan(0);
    for (const line of processing) {
      expect(line.cycles).toHaveLength(line.quantity);
      for (const cycle of line.cycles) {
        expect(cycle.serial).toMatch(/^QMH-/);
        expect(cycle.deliveredAt! >= detail.periodStart && cycle.deliveredAt! < detail.periodEnd).toBe(true);
      }
    }
    const credit = detail.lines.find((l) => l.kind === "sla_credit");
    if (credit) expect(credit.cycles.every((c) => c.late)).toBe(true);
    expect(detail.vatBreakdown.reduce((s, g) => s + g.taxAmountMinor, 0)).toBe(detail.vatMinor);
  });
});

describe("credit notes", () => {
  it("reduce the amount due of an open invoice, ours and the payment service's alike", async () => {
    const id = invoiceId("LSS-2026-10-MDP");
    const finance = await user(FINANCE);
    const before = await invoiceRow(id);
    const lines = await t.db.selectFrom("invoice_lines").selectAll().where("invoice_id", "=", id).orderBy("position").execute();
    const line = lines.find((l) => l.kind === "processing" && l.quantity >= 2)!;
    const cycleIds = (JSON.parse(line.cycle_ids) as number[]).slice(0, 2);
    const note = await createCreditNote(t.db, finance, id, { kind: "lines", lines: [{ lineId: line.id, cycleIds }], reason: "Two cassettes returned unopened" });
    // 2 × unit price, VAT at 20 % on the credit's own taxable amount (BR-CO-17, half away from zero).
    const net = 2 * line.unit_price_minor;
    const vat = Math.round((net * 2000) / 10_000);
    expect(note.totalMinor).toBe(net + vat);
    expect(note.settlement).toBe("amount_due");
    expect(note.number).toBe("LSS-CN-2026-10-MDP-1");

    const after = await invoiceRow(id);
    expect(after.amount_credited_minor).toBe(net + vat);
    expect(after.amount_due_minor).toBe(before.amount_due_minor - (net + vat));
    const remote = await stripeClient().invoices.retrieve(after.stripe_invoice_id!);
    expect(remote.amount_remaining).toBe(after.amount_due_minor);
    expect(remote.amount_due).toBe(after.amount_due_minor);
    const stored = await t.db.selectFrom("credit_notes").selectAll().where("id", "=", note.id).executeTakeFirstOrThrow();
    expect(stored).toMatchObject({ net_minor: net, vat_minor: vat, total_minor: net + vat, settlement: "amount_due", created_by: finance.id });
    expect(stored.stripe_credit_note_id).toMatch(/^cn_/);
    const audit = await t.db.selectFrom("audit_log").selectAll().where("action", "=", "credit_note.created").where("entity_id", "=", String(id)).execute();
    expect(audit).toHaveLength(1);

    // The same cycles cannot be credited twice; nothing is written.
    const counts = await countRows(t.db, [...TABLES]);
    await refused(createCreditNote(t.db, finance, id, { kind: "lines", lines: [{ lineId: line.id, cycleIds }], reason: "again" }), /already credited/);
    expect(await countRows(t.db, [...TABLES])).toEqual(counts);
    // Nor more than was invoiced.
    await refused(
      createCreditNote(t.db, finance, id, { kind: "amount", amountMinor: before.tax_exclusive_minor, description: "Everything", reason: "too much" }),
      /more than the/,
    );
    expect(await countRows(t.db, [...TABLES])).toEqual(counts);
  });

  it("refund a card payment for a paid invoice, or are settled outside the payment service when it was paid by transfer", async () => {
    const finance = await user(FINANCE);
    const paidOnline = invoiceId("LSS-2026-11-QMH");
    const note = await createCreditNote(t.db, finance, paidOnline, { kind: "amount", amountMinor: 5_000, description: "Goodwill credit", reason: "Late delivery to theatres" });
    expect(note).toMatchObject({ settlement: "refund", totalMinor: 6_000, amountDueMinor: 0 });
    const refunds = await stripeClient().refunds.list({ limit: 10 });
    expect(refunds.data.map((r) => r.amount)).toContain(6_000);

    // Paid by bank transfer before the invoice had a copy: the credit note is ours alone.
    const byTransfer = invoiceId("LSS-2026-10-ODS");
    await refused(
      createCreditNote(t.db, finance, byTransfer, { kind: "amount", amountMinor: 1_000, description: "Credit", reason: "x", settlement: "refund" }),
      /not paid online/,
    );
    const local = await createCreditNote(t.db, finance, byTransfer, { kind: "amount", amountMinor: 1_000, description: "Credit", reason: "Missing instrument" });
    expect(local.settlement).toBe("out_of_band");
    expect((await t.db.selectFrom("credit_notes").select("stripe_credit_note_id").where("id", "=", local.id).executeTakeFirstOrThrow()).stripe_credit_note_id).toBeNull();
  });
});

describe("voiding and writing off", () => {
  it("voids an open invoice in the payment service and here, and refuses a paid one", async () => {
    const finance = await user(FINANCE);
    const id = invoiceId("LSS-2026-10-PVC");
    await ensureStripeInvoice(t.db, id);
    await refused(closeInvoice(t.db, finance, invoiceId("LSS-2026-10-QMH"), { to: "void", reason: "x" }), /credit note instead/);
    expect(await closeInvoice(t.db, finance, id, { to: "void", reason: "Issued to the wrong customer" })).toEqual({ status: "void" });
    await fake.webhooksIdle();
    const row = await invoiceRow(id);
    expect(row.status).toBe("void");
    expect((await stripeClient().invoices.retrieve(row.stripe_invoice_id!)).status).toBe("void");
    await refused(closeInvoice(t.db, finance, id, { to: "uncollectible", reason: "x" }), /only open/);
  });
});

describe("reminders", () => {
  const at = (date: string) => new Date(`${date}T09:00:00Z`);
  const reminders = () => t.db.selectFrom("outbox").selectAll().where("template", "=", "billing.reminder").orderBy("id").execute();

  it("follow finance's schedule: the latest rule reached, once, never before the due date, never for paid invoices", async () => {
    expect(await reminderSchedule(t.db)).toEqual([7, 21, 45]);
    // Worked by hand: due 15 Nov; 7 days → 22 Nov, 21 → 6 Dec, 45 → 30 Dec.
    expect(ruleReached([7, 21, 45], "2026-11-15", "2026-11-21")).toBeNull();
    expect(ruleReached([7, 21, 45], "2026-11-15", "2026-11-22")).toBe(7);
    expect(ruleReached([7, 21, 45], "2026-11-15", "2026-12-06")).toBe(21);

    const overdue = invoiceId("LSS-2026-10-MDP"); // due 15 Nov, 14-day terms
    const notYet = invoiceId("LSS-2026-11-MDP"); // due 15 Dec
    const before = (await reminders()).length;
    const first = await sendDueReminders(t.db, at("2026-12-01"));
    const afterFirst = await reminders();
    const mine = afterFirst.slice(before);
    // 1 Dec: only the October invoice of the dental group is past a rule (16 days: the 7-day one).
    expect(mine.map((m) => m.dedupe_key)).toEqual([`invoice_reminder:${overdue}:7:${MDP_MANAGER}`]);
    expect(first).toEqual({ invoices: 1, queued: 1 });
    expect(mine[0]!.subject).toBe("Reminder: invoice LSS-2026-10-MDP is 16 days overdue");
    expect(mine[0]!.text_body).toContain("was due on");

    // The same day again, and the next: nothing new.
    expect(await sendDueReminders(t.db, at("2026-12-01"))).toEqual({ invoices: 0, queued: 0 });
    expect(await sendDueReminders(t.db, at("2026-12-02"))).toEqual({ invoices: 0, queued: 0 });
    // 6 Dec: the 21-day rule.
    expect(await sendDueReminders(t.db, at("2026-12-06"))).toEqual({ invoices: 1, queued: 1 });
    // 16 Dec: the November invoice is one day overdue, before its first rule.
    await sendDueReminders(t.db, at("2026-12-16"));
    expect((await reminders()).some((m) => m.dedupe_key?.startsWith(`invoice_reminder:${notYet}:`))).toBe(false);
    // 22 Dec: its 7-day rule.
    await sendDueReminders(t.db, at("2026-12-22"));
    expect((await reminders()).filter((m) => m.dedupe_key?.startsWith(`invoice_reminder:${notYet}:7:`))).toHaveLength(1);
    // Paid and void invoices never get one.
    const paid = [invoiceId("LSS-2026-10-QMH"), invoiceId("LSS-2026-10-ODS"), invoiceId("LSS-2026-11-QMH"), invoiceId("LSS-2026-10-PVC")];
    expect((await reminders()).some((m) => paid.some((id) => m.dedupe_key?.startsWith(`invoice_reminder:${id}:`)))).toBe(false);

    const detail = await getInvoiceDetail(t.db, await user(FINANCE), overdue, at("2026-12-06"));
    expect(detail.reminders.map((r) => r.daysAfterDue)).toEqual([7, 21]);
  });

  it("run every morning at 08:00 in the unit's zone from the job scheduler, once a day", async () => {
    // 1 Jan 2027 is in GMT: 08:00 local = 08:00Z. Before it, the period is the day before.
    expect(dailyPeriod(new Date("2027-01-01T07:59:00Z"), "Europe/London")).toEqual({ key: "2026-12-31", scheduledAt: new Date("2026-12-31T08:00:00Z") });
    expect(dailyPeriod(new Date("2027-01-01T08:00:00Z"), "Europe/London").key).toBe("2027-01-01");
    const [first] = await runDueJobs(t.db, new Date("2027-01-01T08:05:00Z"), [invoiceRemindersJob]);
    expect(first).toMatchObject({ name: "invoice_reminders", period: "2027-01-01", ran: true });
    // 1 Jan 2027: the October invoice is 47 days overdue, past its 45-day rule.
    expect(first!.result).toMatchObject({ queued: 1 });
    const [again] = await runDueJobs(t.db, new Date("2027-01-01T15:00:00Z"), [invoiceRemindersJob]);
    expect(again).toMatchObject({ ran: false });
  });

  it("keep the schedule finance sets, refusing what makes no sense without changing it", async () => {
    const finance = await user(FINANCE);
    expect(await setReminderSchedule(t.db, finance, [30, 10])).toEqual([10, 30]);
    expect(await reminderSchedule(t.db)).toEqual([10, 30]);
    await refused(setReminderSchedule(t.db, finance, [10, 10]), /once/);
    await refused(setReminderSchedule(t.db, finance, [0]), /1 to 365/);
    expect(await reminderSchedule(t.db)).toEqual([10, 30]);
    await setReminderSchedule(t.db, finance, [7, 21, 45]);
  });
});

describe("the invoice routes", () => {
  it("list only the caller's own organisation's invoices, with their age", async () => {
    const res = await listRoute(await requestAs(seed.users[QMH_MANAGER]!, "/api/billing/invoices?pageSize=50"), params({}));
    expect(res.status).toBe(200);
    const body = (await res.json()) as { rows: InvoiceListRow[]; total: number };
    expect(body.total).toBeGreaterThan(0);
    expect(body.rows.every((r) => r.organisationId === seed.organisations.QMH)).toBe(true);

    const all = (await (await listRoute(await requestAs(seed.users[FINANCE]!, "/api/billing/invoices?pageSize=50&status=open&age=1_30"), params({}))).json()) as {
      rows: InvoiceListRow[];
    };
    expect(all.rows.every((r) => r.status === "open" && r.ageBucket === "1_30")).toBe(true);
    expect(ageBucketOf(0)).toBe("current");
    expect(ageBucketOf(30)).toBe("1_30");
    expect(ageBucketOf(31)).toBe("31_60");
    expect(ageBucketOf(91)).toBe("over_90");

    const summary = await summaryRoute(await requestAs(seed.users[FINANCE]!, "/api/billing/invoices/summary"), params({}));
    expect(summary.status).toBe(200);
  });

  it("answer 404 for another organisation's invoice on every route, and 401 without a session", async () => {
    const id = String(invoiceId("LSS-2026-11-ODS"));
    const other = seed.users[QMH_MANAGER]!;
    for (const [route, url, extra] of [
      [invoiceRoute, `/api/billing/invoices/${id}`, {}],
      [invoicePdfRoute, `/api/billing/invoices/${id}/invoice.pdf`, {}],
      [invoiceXmlRoute, `/api/billing/invoices/${id}/invoice.xml`, {}],
    ] as const) {
      const res = await route(await requestAs(other, url), params({ id, ...extra }));
      expect(res.status, url).toBe(404);
      const own = await route(await requestAs(seed.users[ODS_MANAGER]!, url), params({ id, ...extra }));
      expect(own.status, url).toBe(200);
    }
    const creditNote = await t.db.selectFrom("credit_notes").select(["id", "invoice_id"]).where("invoice_id", "=", invoiceId("LSS-2026-10-ODS")).executeTakeFirstOrThrow();
    const cnParams = { id: String(creditNote.invoice_id), creditNoteId: String(creditNote.id) };
    const url = `/api/billing/invoices/${cnParams.id}/credit-notes/${cnParams.creditNoteId}/credit-note.xml`;
    expect((await creditNoteXmlRoute(await requestAs(other, url), params(cnParams))).status).toBe(404);
    expect((await creditNoteXmlRoute(await requestAs(seed.users[ODS_MANAGER]!, url), params(cnParams))).status).toBe(200);
    // A credit note reached through another invoice's id is not found either.
    const mismatched = { id: String(invoiceId("LSS-2026-11-ODS")), creditNoteId: String(creditNote.id) };
    expect((await creditNoteXmlRoute(await requestAs(seed.users[ODS_MANAGER]!, url), params(mismatched))).status).toBe(404);

    const csv = await (await headersCsvRoute(await requestAs(other, "/api/billing/invoices/headers.csv"), params({}))).text();
    expect(csv).not.toContain("LSS-2026-11-ODS");
    expect(csv).toContain("LSS-2026-11-QMH");

    expect((await invoiceRoute(await requestAs(null, `/api/billing/invoices/${id}`), params({ id }))).status).toBe(401);
    // Clinic staff have no billing permission at all.
    expect((await invoiceRoute(await requestAs(seed.users["theatres@quillby.example"]!, `/api/billing/invoices/${id}`), params({ id }))).status).toBe(403);
  });
});
