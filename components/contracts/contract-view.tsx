import { Clock, Info } from "lucide-react";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import {
  describeBand,
  describeSurcharge,
  formatLocalDate,
  formatMoney,
  formatPercent,
  formatValidity,
  SURCHARGE_KIND_LABELS,
  turnaroundSentence,
  VAT_CATEGORY_LABELS,
} from "@/lib/contracts/format";
import type { ContractDetail } from "@/lib/contracts/service";
import { formatDayHours, WEEKDAY_LABELS, WEEKDAYS } from "@/lib/sites/opening-hours";
import { ContractStatusBadge } from "./status-badge";

/** One contract version in words and tables: the same view for the unit and for the customer. */
export function ContractView({
  contract,
  showCustomer = false,
  today,
}: {
  contract: ContractDetail;
  showCustomer?: boolean;
  /** The unit's date today: holidays before it fold away. */
  today?: string;
}) {
  const money = (minor: number) => formatMoney(minor, contract.currency);
  const calendar = contract.serviceCalendar;
  const holidays = [...calendar.holidays].sort();
  const coming = today ? holidays.filter((day) => day >= today) : holidays;
  const earlier = today ? holidays.filter((day) => day < today) : [];
  return (
    <div className="space-y-6">
      <Card>
        <CardBody className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
          {showCustomer && <Fact label="Customer" value={contract.organisationName} />}
          <Fact label="Reference" value={contract.reference} />
          <Fact label="Valid" value={formatValidity(contract.validFrom, contract.validUntil)} />
          <div>
            <p className="text-xs font-medium uppercase tracking-wide text-muted">Status</p>
            <div className="mt-1">
              <ContractStatusBadge status={contract.status} />
            </div>
          </div>
          {!showCustomer && <Fact label="Currency" value={contract.currency} />}
        </CardBody>
      </Card>

      <div className="grid gap-6 lg:grid-cols-2">
        <Card>
          <CardHeader title="Turnaround" description="How soon sets come back, counted in service hours." />
          <CardBody className="space-y-3 text-sm">
            {(["standard", "express"] as const).map((level) => (
              <p key={level} className="flex gap-2 text-ink" data-testid={`turnaround-${level}`}>
                <Clock className="mt-0.5 h-4 w-4 shrink-0 text-lagoon-700" aria-hidden="true" />
                {turnaroundSentence(
                  level,
                  level === "standard" ? contract.turnaroundStandardHours : contract.turnaroundExpressHours,
                  contract.clockStopsAt,
                )}
              </p>
            ))}
            <p className="text-muted">
              The clock starts when the sets are received at the unit and runs only during the service hours below, never on the
              listed holidays.
            </p>
            <p className="flex gap-2 rounded-lg bg-paper px-3 py-2 text-ink-soft">
              <Info className="mt-0.5 h-4 w-4 shrink-0 text-muted" aria-hidden="true" />
              A turnaround promise never shortens reprocessing: sets leave the unit only once its qualified staff have released them
              under its validated procedures. Late sets earn the credit below instead.
            </p>
          </CardBody>
        </Card>

        <Card>
          <CardHeader title="Service hours" description={`Local time, ${calendar.timeZone}.`} />
          <CardBody className="space-y-4 text-sm">
            <dl className="grid grid-cols-[7rem_1fr] gap-x-2 gap-y-1">
              {WEEKDAYS.map((day) => (
                <div key={day} className="contents">
                  <dt className="text-muted">{WEEKDAY_LABELS[day]}</dt>
                  <dd className="tabular-nums">{formatDayHours(calendar.hours[day])}</dd>
                </div>
              ))}
            </dl>
            <div>
              <h3 className="font-medium text-ink">Holidays (closed all day)</h3>
              {calendar.holidays.length === 0 ? (
                <p className="mt-1 text-muted">None listed.</p>
              ) : (
                <>
                  {coming.length > 0 ? <HolidayList days={coming} /> : <p className="mt-1 text-muted">No more holidays listed.</p>}
                  {earlier.length > 0 && (
                    <details className="mt-2">
                      <summary className="cursor-pointer text-muted">Earlier holidays ({earlier.length})</summary>
                      <HolidayList days={earlier} />
                    </details>
                  )}
                </>
              )}
            </div>
          </CardBody>
        </Card>
      </div>

      <Card>
        <CardHeader
          title="Rate card"
          description="The processing fee per set, by set class. Where a class has bands, each band is priced at its own rate: the count restarts every calendar month."
        />
        <div className="overflow-x-auto">
          <table className="w-full text-left text-sm">
            <caption className="sr-only">Processing fee per set class</caption>
            <thead className="border-b border-line bg-paper/60 text-xs uppercase tracking-wide text-muted">
              <tr>
                <th scope="col" className="px-5 py-2 font-semibold">
                  Set class
                </th>
                <th scope="col" className="px-5 py-2 font-semibold">
                  Sets
                </th>
                <th scope="col" className="px-5 py-2 text-right font-semibold">
                  Price per set
                </th>
              </tr>
            </thead>
            <tbody className="divide-y divide-line">
              {contract.rates.map((rate) =>
                rate.bands.map((band, index) => (
                  <tr key={`${rate.setClass}-${index}`} className={index > 0 ? "border-t-0" : undefined}>
                    {index === 0 && (
                      <th scope="row" rowSpan={rate.bands.length} className="px-5 py-2 align-top font-medium text-ink">
                        {rate.label}
                      </th>
                    )}
                    <td className="px-5 py-2 text-ink-soft">{describeBand(rate.bands, index)}</td>
                    <td className="px-5 py-2 text-right tabular-nums">{money(band.unitPriceMinor)}</td>
                  </tr>
                )),
              )}
            </tbody>
          </table>
        </div>
      </Card>

      <div className="grid gap-6 lg:grid-cols-2">
        <Card>
          <CardHeader title="Surcharges" description="Added to a set's processing fee when the set carries them." />
          <CardBody className="text-sm">
            {contract.surcharges.length === 0 ? (
              <p className="text-muted">No surcharges.</p>
            ) : (
              <dl className="space-y-2">
                {contract.surcharges.map((rule) => (
                  <div key={rule.kind} className="flex flex-wrap justify-between gap-x-4">
                    <dt className="text-ink">{SURCHARGE_KIND_LABELS[rule.kind]}</dt>
                    <dd className="tabular-nums text-ink-soft">{describeSurcharge(rule, contract.currency)}</dd>
                  </div>
                ))}
              </dl>
            )}
            <p className="mt-3 text-muted">Surcharges not listed here are not charged under this version.</p>
          </CardBody>
        </Card>

        <Card>
          <CardHeader title="Billing terms" />
          <CardBody className="text-sm">
            <dl className="space-y-2">
              <Term label="Minimum monthly fee" value={`${money(contract.minimumMonthlyFeeMinor)}`} />
              <Term
                label="Credit for a late set"
                value={
                  contract.slaCreditBasisPoints === 0
                    ? "None"
                    : `${formatPercent(contract.slaCreditBasisPoints)} of that set's processing fee`
                }
              />
              <Term label="VAT" value={`${VAT_CATEGORY_LABELS[contract.vatCategory]}, ${formatPercent(contract.vatRateBasisPoints)}`} />
              <Term label="Payment terms" value={`${contract.paymentTermsDays} days from the invoice date`} />
              <Term label="Currency" value={contract.currency} />
            </dl>
            <p className="mt-3 text-muted">
              The minimum fee tops up a month whose processing fees and surcharges come to less; the credit for late sets is then
              taken off.
            </p>
          </CardBody>
        </Card>
      </div>

      {contract.notes && (
        <Card>
          <CardHeader title="Notes" />
          <CardBody className="whitespace-pre-line text-sm text-ink-soft">{contract.notes}</CardBody>
        </Card>
      )}
    </div>
  );
}

function HolidayList({ days }: { days: string[] }) {
  return (
    <ul className="mt-1 grid gap-x-4 gap-y-0.5 sm:grid-cols-2">
      {days.map((day) => (
        <li key={day} className="tabular-nums text-ink-soft">
          {formatLocalDate(day, { weekday: true })}
        </li>
      ))}
    </ul>
  );
}

function Fact({ label, value }: { label: string; value: string }) {
  return (
    <div>
      <p className="text-xs font-medium uppercase tracking-wide text-muted">{label}</p>
      <p className="mt-1 font-medium text-ink">{value}</p>
    </div>
  );
}

function Term({ label, value }: { label: string; value: string }) {
  return (
    <div className="flex flex-wrap justify-between gap-x-4">
      <dt className="text-muted">{label}</dt>
      <dd className="text-right text-ink">{value}</dd>
    </div>
  );
}
