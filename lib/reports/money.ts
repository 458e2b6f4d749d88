import { AGE_BUCKETS, type AgeBucket, ageBucketOf, daysPastDue } from "@/lib/billing/ageing";
import { formatMinor } from "@/lib/pricing/money";
import { bucketLabel, bucketOf, bucketsBetween } from "./periods";
import type { Report } from "./types";

// Revenue and receivables (pure).
//
// Decisions:
// - Revenue is what issued invoices billed (open, paid or written off; never drafts or void
//   invoices), in the month of the invoice's billing period (unit time), net of VAT, with the
//   credit notes raised against them shown beside. Amounts are never added across currencies.
// - Receivables are the amounts still due on open invoices, by whole days past the due date to
//   the unit's today, in the same buckets as the invoice list (lib/billing/ageing.ts): not yet
//   due (due today or later), 1–30, 31–60, 61–90 and over 90 days.

export interface RevenueInvoice {
  organisationId: number;
  customer: string;
  currency: string;
  periodStart: string;
  netMinor: number;
  vatMinor: number;
  totalMinor: number;
  creditedMinor: number;
}

export function revenueReport(invoices: readonly RevenueInvoice[], input: { timeZone: string; from: string; to: string }): Report {
  const groups = new Map<string, { organisationId: number; customer: string; currency: string; month: string; invoices: number; net: number; vat: number; total: number; credited: number }>();
  for (const inv of invoices) {
    const month = bucketOf(inv.periodStart, "month", input.timeZone);
    const key = `${inv.organisationId}|${inv.currency}|${month}`;
    const g = groups.get(key) ?? { organisationId: inv.organisationId, customer: inv.customer, currency: inv.currency, month, invoices: 0, net: 0, vat: 0, total: 0, credited: 0 };
    g.invoices += 1;
    g.net += inv.netMinor;
    g.vat += inv.vatMinor;
    g.total += inv.totalMinor;
    g.credited += inv.creditedMinor;
    groups.set(key, g);
  }
  const rows = [...groups.values()].sort((a, b) => a.customer.localeCompare(b.customer) || a.month.localeCompare(b.month) || a.currency.localeCompare(b.currency));
  const currencies = [...new Set(rows.map((r) => r.currency))].sort();
  const chartCurrency = currencies[0] ?? "GBP";
  const customers = [...new Map(rows.filter((r) => r.currency === chartCurrency).map((r) => [r.organisationId, r.customer])).entries()].sort((a, b) => a[1].localeCompare(b[1]));
  const months = bucketsBetween(input.from, input.to, "month");
  return {
    name: "revenue",
    title: "Revenue",
    notes: [
      "Net amounts (without VAT) of issued invoices, in the month each invoice bills; credit notes raised against them are shown beside, not taken off.",
      ...(currencies.length > 1 ? [`Several currencies (${currencies.join(", ")}): the chart shows ${chartCurrency} only; the table shows each.`] : []),
    ],
    charts: [
      {
        kind: "stacked-bar",
        title: `Net invoiced per month, by customer (${chartCurrency})`,
        x: "month",
        xLabel: "Billing month",
        yLabel: `Net (${chartCurrency})`,
        series: customers.map(([id, name]) => ({ key: `c${id}`, label: name })),
        points: months.map((month) => {
          const point: Record<string, string | number | null> = { month: bucketLabel(month, "month") };
          for (const [id] of customers) {
            const g = rows.find((r) => r.organisationId === id && r.month === month && r.currency === chartCurrency);
            point[`c${id}`] = g ? g.net / 100 : 0;
          }
          return point;
        }),
      },
    ],
    tables: [
      {
        key: "revenue",
        title: "Invoiced per customer and month",
        columns: [
          { key: "customer", label: "Customer" },
          { key: "month", label: "Month" },
          { key: "currency", label: "Currency" },
          { key: "invoices", label: "Invoices", numeric: true },
          { key: "net", label: "Net", numeric: true },
          { key: "vat", label: "VAT", numeric: true },
          { key: "total", label: "Total", numeric: true },
          { key: "credited", label: "Credited", numeric: true },
        ],
        rows: rows.map((r) => ({
          customer: r.customer,
          month: r.month,
          currency: r.currency,
          invoices: r.invoices,
          net: formatMinor(r.net),
          vat: formatMinor(r.vat),
          total: formatMinor(r.total),
          credited: formatMinor(r.credited),
        })),
      },
    ],
  };
}

export interface OpenInvoice {
  organisationId: number;
  customer: string;
  number: string;
  currency: string;
  dueDate: string;
  amountDueMinor: number;
}

export const AGE_COLUMN_LABELS: Record<AgeBucket, string> = {
  current: "Not yet due",
  "1_30": "1–30 days",
  "31_60": "31–60 days",
  "61_90": "61–90 days",
  over_90: "Over 90 days",
};

/** Amounts due per customer and currency in each age bucket. */
export function ageReceivables(invoices: readonly OpenInvoice[], today: string) {
  const groups = new Map<string, { customer: string; currency: string; buckets: Record<AgeBucket, number>; total: number }>();
  for (const inv of invoices) {
    if (inv.amountDueMinor <= 0) continue;
    const key = `${inv.customer}|${inv.currency}`;
    const g = groups.get(key) ?? { customer: inv.customer, currency: inv.currency, buckets: { current: 0, "1_30": 0, "31_60": 0, "61_90": 0, over_90: 0 }, total: 0 };
    g.buckets[ageBucketOf(daysPastDue(inv.dueDate, today))] += inv.amountDueMinor;
    g.total += inv.amountDueMinor;
    groups.set(key, g);
  }
  return [...groups.values()].sort((a, b) => a.customer.localeCompare(b.customer) || a.currency.localeCompare(b.currency));
}

export function receivablesReport(invoices: readonly OpenInvoice[], today: string): Report {
  const groups = ageReceivables(invoices, today);
  const owed = invoices.filter((i) => i.amountDueMinor > 0).sort((a, b) => a.dueDate.localeCompare(b.dueDate) || a.number.localeCompare(b.number));
  const currencies = [...new Set(groups.map((g) => g.currency))].sort();
  const chartCurrency = currencies[0] ?? "GBP";
  return {
    name: "receivables",
    title: "Receivables by age",
    notes: [
      `Amounts still due on open invoices on ${today}, by whole days past their due date (the same buckets as the invoice list).`,
      ...(currencies.length > 1 ? [`Several currencies (${currencies.join(", ")}): the chart shows ${chartCurrency} only.`] : []),
    ],
    charts: [
      {
        kind: "stacked-bar",
        title: `Amount due per customer, by age (${chartCurrency})`,
        x: "customer",
        xLabel: "Customer",
        yLabel: `Due (${chartCurrency})`,
        series: AGE_BUCKETS.map((b) => ({ key: b, label: AGE_COLUMN_LABELS[b] })),
        points: groups
          .filter((g) => g.currency === chartCurrency)
          .map((g) => ({ customer: g.customer, ...Object.fromEntries(AGE_BUCKETS.map((b) => [b, g.buckets[b] / 100])) })),
      },
    ],
    tables: [
      {
        key: "ageing",
        title: "Amount due per customer and age",
        columns: [
          { key: "customer", label: "Customer" },
          { key: "currency", label: "Currency" },
          ...AGE_BUCKETS.map((b) => ({ key: b, label: AGE_COLUMN_LABELS[b], numeric: true })),
          { key: "total", label: "Total due", numeric: true },
        ],
        rows: groups.map((g) => ({
          customer: g.customer,
          currency: g.currency,
          ...Object.fromEntries(AGE_BUCKETS.map((b) => [b, formatMinor(g.buckets[b])])),
          total: formatMinor(g.total),
        })),
      },
      {
        key: "invoices",
        title: "Open invoices",
        columns: [
          { key: "number", label: "Invoice" },
          { key: "customer", label: "Customer" },
          { key: "due_date", label: "Due" },
          { key: "days_past_due", label: "Days past due", numeric: true },
          { key: "age", label: "Age" },
          { key: "currency", label: "Currency" },
          { key: "amount_due", label: "Amount due", numeric: true },
        ],
        rows: owed.map((i) => {
          const days = daysPastDue(i.dueDate, today);
          return { number: i.number, customer: i.customer, due_date: i.dueDate, days_past_due: days, age: AGE_COLUMN_LABELS[ageBucketOf(days)], currency: i.currency, amount_due: formatMinor(i.amountDueMinor) };
        }),
      },
    ],
  };
}
