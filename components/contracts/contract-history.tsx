import { Card, CardHeader } from "@/components/ui/card";
import type { ContractHistoryEntry } from "@/lib/contracts/service";
import { isSetClass, SET_CLASS_LABELS } from "@/lib/catalogue/vocabulary";
import { describeSurcharge, formatMoney, formatPercent, SURCHARGE_KIND_LABELS } from "@/lib/contracts/format";
import type { SurchargeRule } from "@/lib/pricing/types";
import { formatDateTime } from "@/lib/format";

const ACTION_LABELS: Record<string, string> = {
  "contract.created": "Created",
  "contract.updated": "Corrected",
  "contract.ended": "Last day set",
};

const FIELD_LABELS: Record<string, string> = {
  reference: "Reference",
  validFrom: "Valid from",
  validUntil: "Valid until",
  currency: "Currency",
  vatCategory: "VAT category",
  vatRateBasisPoints: "VAT rate",
  paymentTermsDays: "Payment terms (days)",
  turnaroundStandardHours: "Standard turnaround (hours)",
  turnaroundExpressHours: "Express turnaround (hours)",
  clockStopsAt: "Clock stops at",
  serviceCalendar: "Service calendar",
  minimumMonthlyFeeMinor: "Minimum monthly fee",
  slaCreditBasisPoints: "Credit for a late set",
  notes: "Notes",
  rates: "Rate card",
  surcharges: "Surcharges",
};

type Bands = { upToQuantity: number | null; unitPriceMinor: number }[];

function bandsText(bands: Bands | undefined, currency: string): string {
  if (!bands || bands.length === 0) return "no rate";
  return bands
    .map((b) => (b.upToQuantity === null ? formatMoney(b.unitPriceMinor, currency) : `${formatMoney(b.unitPriceMinor, currency)} up to ${b.upToQuantity}`))
    .join(", ");
}

/** One line per changed value; the rate card and surcharges name each class or kind that changed. */
function describeChange(field: string, before: unknown, after: unknown, currency: string): string[] {
  const label = FIELD_LABELS[field] ?? field;
  const plain = (value: unknown) => (value === null || value === undefined || value === "" ? "—" : String(value));
  switch (field) {
    case "minimumMonthlyFeeMinor":
      return [`${label}: ${formatMoney(Number(before), currency)} → ${formatMoney(Number(after), currency)}`];
    case "vatRateBasisPoints":
    case "slaCreditBasisPoints":
      return [`${label}: ${formatPercent(Number(before))} → ${formatPercent(Number(after))}`];
    case "rates": {
      const map = (value: unknown) => new Map(((value ?? []) as { setClass: string; bands: Bands }[]).map((r) => [r.setClass, r.bands]));
      const b = map(before);
      const a = map(after);
      return [...new Set([...b.keys(), ...a.keys()])]
        .filter((setClass) => JSON.stringify(b.get(setClass)) !== JSON.stringify(a.get(setClass)))
        .map((setClass) => {
          const name = isSetClass(setClass) ? SET_CLASS_LABELS[setClass] : setClass;
          return `${name}: ${bandsText(b.get(setClass), currency)} → ${bandsText(a.get(setClass), currency)}`;
        });
    }
    case "surcharges": {
      const map = (value: unknown) => new Map(((value ?? []) as SurchargeRule[]).map((r) => [r.kind, r]));
      const b = map(before);
      const a = map(after);
      const text = (rule: SurchargeRule | undefined) => (rule ? describeSurcharge(rule, currency) : "not charged");
      return [...new Set([...b.keys(), ...a.keys()])]
        .filter((kind) => JSON.stringify(b.get(kind)) !== JSON.stringify(a.get(kind)))
        .map((kind) => `${SURCHARGE_KIND_LABELS[kind]}: ${text(b.get(kind))} → ${text(a.get(kind))}`);
    }
    case "serviceCalendar":
      return [`${label}: working hours or holidays changed`];
    case "notes":
      return [`${label} changed`];
    default:
      return [`${label}: ${plain(before)} → ${plain(after)}`];
  }
}

/** Who changed a version and what changed, from the audit log. */
export function ContractHistory({ entries, currency }: { entries: ContractHistoryEntry[]; currency: string }) {
  return (
    <Card>
      <CardHeader title="Changes" description="Every change to this version, with the value before and after." />
      {entries.length === 0 ? (
        <p className="px-5 py-4 text-sm text-muted">No changes recorded.</p>
      ) : (
        <ol className="divide-y divide-line">
          {entries.map((entry) => (
            <li key={entry.id} className="px-5 py-3 text-sm">
              <p className="font-medium text-ink">
                {ACTION_LABELS[entry.action] ?? entry.action}
                <span className="font-normal text-muted">
                  {" "}
                  · {formatDateTime(entry.at)} · {entry.actorName ?? "system"}
                </span>
              </p>
              {entry.changes.length > 0 && (
                <ul className="mt-1 space-y-0.5 text-ink-soft">
                  {entry.changes.flatMap((change) =>
                    describeChange(change.field, change.before, change.after, currency).map((line, i) => (
                      <li key={`${change.field}-${i}`}>{line}</li>
                    )),
                  )}
                </ul>
              )}
            </li>
          ))}
        </ol>
      )}
    </Card>
  );
}
