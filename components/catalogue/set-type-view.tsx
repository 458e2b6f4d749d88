import { AlertTriangle, FileText, Info } from "lucide-react";
import Link from "next/link";
import type { ReactNode } from "react";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { formatDateTime } from "@/lib/format";
import { formatStu, formatWeight, gramsToKgText, stuText } from "@/lib/catalogue/measures";
import type { SetTypeDetail } from "@/lib/catalogue/set-types";
import {
  PACKAGING_LABELS,
  PROCESSING_FLAG_LABELS,
  SET_CLASS_LABELS,
  STERILISATION_METHOD_LABELS,
} from "@/lib/catalogue/vocabulary";
import type { SetTypeFormDefaults } from "./set-type-form-dialog";
import { SetTypeBadges } from "./set-type-labels";

/** The edit form's starting values for a stored set type. */
export function formDefaultsOf(detail: SetTypeDetail): SetTypeFormDefaults {
  return {
    code: detail.code,
    name: detail.name,
    setClass: detail.setClass,
    packaging: detail.packaging,
    sterilisationMethod: detail.sterilisationMethod,
    flags: detail.flags,
    processingNotes: detail.processingNotes ?? "",
    weightKg: gramsToKgText(detail.weightG),
    sizeStu: stuText(detail.sizeStu),
    items: detail.items.map((i) => ({ name: i.name, quantity: String(i.quantity) })),
    ifu: detail.ifu ? { id: detail.ifu.id, name: detail.ifu.name } : null,
  };
}

function Fact({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div>
      <dt className="text-xs font-medium uppercase tracking-wide text-muted">{label}</dt>
      <dd className="mt-0.5 text-sm text-ink">{children}</dd>
    </div>
  );
}

const kb = (bytes: number) => `${Math.max(1, Math.round(bytes / 1024))} KB`;

/** A set type's card: what it is, how it is processed, its IFU and its contents list. */
export function SetTypeView({ setType, backHref, actions }: { setType: SetTypeDetail; backHref: string; actions?: ReactNode }) {
  return (
    <div className="space-y-6">
      <div className="flex flex-col gap-3 sm:flex-row sm:items-end sm:justify-between">
        <div>
          <Link href={backHref} className="text-sm font-medium text-lagoon-700 hover:underline">
            ← Set catalogue
          </Link>
          <p className="mt-3 font-mono text-sm font-semibold text-muted">{setType.code}</p>
          <h1 className="text-2xl font-semibold tracking-tight text-ink">{setType.name}</h1>
          <div className="mt-2 flex flex-wrap gap-1.5">
            <SetTypeBadges setClass={setType.setClass} hasIfu={setType.hasIfu} active={setType.active} />
          </div>
        </div>
        {actions && <div className="flex flex-wrap gap-2">{actions}</div>}
      </div>

      {setType.missingIfu && (
        <p role="status" className="flex gap-2 rounded-card border border-warn-600/30 bg-warn-50 px-4 py-3 text-sm text-warn-700">
          <AlertTriangle className="mt-0.5 h-4 w-4 shrink-0" aria-hidden="true" />
          This loaner set has no instructions for use on file. Bookings refuse loaner sets until the supplier&apos;s IFU is uploaded.
        </p>
      )}

      <div className="grid gap-6 lg:grid-cols-[1fr_1.2fr]">
        <Card>
          <CardHeader title="Details" description={setType.organisationName} />
          <CardBody className="space-y-5">
            <dl className="grid grid-cols-2 gap-4">
              <Fact label="Set class">{SET_CLASS_LABELS[setType.setClass] ?? setType.setClass}</Fact>
              <Fact label="Packaging">{PACKAGING_LABELS[setType.packaging]}</Fact>
              <Fact label="Sterilisation">{STERILISATION_METHOD_LABELS[setType.sterilisationMethod]}</Fact>
              <Fact label="Weight">{formatWeight(setType.weightG)}</Fact>
              <Fact label="Size">
                {formatStu(setType.sizeStu)} <span className="text-muted">(1 StU = 300 × 300 × 600 mm)</span>
              </Fact>
              <Fact label="Last changed">{formatDateTime(setType.updatedAt)}</Fact>
            </dl>
            <div>
              <h3 className="text-xs font-medium uppercase tracking-wide text-muted">Processing</h3>
              {setType.flags.length ? (
                <ul className="mt-1 list-inside list-disc text-sm text-ink">
                  {setType.flags.map((f) => (
                    <li key={f}>{PROCESSING_FLAG_LABELS[f]}</li>
                  ))}
                </ul>
              ) : (
                <p className="mt-1 text-sm text-muted">No special steps.</p>
              )}
              {setType.processingNotes && <p className="mt-2 whitespace-pre-line rounded-lg bg-paper px-3 py-2 text-sm text-ink">{setType.processingNotes}</p>}
            </div>
            <div>
              <h3 className="text-xs font-medium uppercase tracking-wide text-muted">Instructions for use</h3>
              {setType.ifu ? (
                <a
                  href={`/api/files/${setType.ifu.id}`}
                  target="_blank"
                  rel="noreferrer"
                  className="mt-1 inline-flex items-center gap-2 text-sm font-medium text-lagoon-800 underline"
                >
                  <FileText className="h-4 w-4" aria-hidden="true" />
                  {setType.ifu.name} <span className="font-normal text-muted">({kb(setType.ifu.sizeBytes)} PDF)</span>
                </a>
              ) : (
                <p className="mt-1 text-sm text-muted">None on file.</p>
              )}
            </div>
            <p className="flex gap-2 text-xs text-muted">
              <Info className="mt-0.5 h-3.5 w-3.5 shrink-0" aria-hidden="true" />
              These notes support the work; the manufacturer&apos;s instructions for use, the unit&apos;s validated procedures and its qualified
              staff decide how a set is processed.
            </p>
          </CardBody>
        </Card>

        <Card>
          <CardHeader title="Contents" description={`${setType.instrumentCount} instrument${setType.instrumentCount === 1 ? "" : "s"} in ${setType.itemCount} line${setType.itemCount === 1 ? "" : "s"}`} />
          <div className="overflow-x-auto">
            <table className="w-full text-left text-sm">
              <caption className="sr-only">Contents of {setType.name}</caption>
              <thead className="border-b border-line bg-paper/60 text-xs uppercase tracking-wide text-muted">
                <tr>
                  <th scope="col" className="w-10 px-4 py-2 font-semibold">
                    #
                  </th>
                  <th scope="col" className="px-4 py-2 font-semibold">
                    Instrument
                  </th>
                  <th scope="col" className="px-4 py-2 text-right font-semibold">
                    Count
                  </th>
                </tr>
              </thead>
              <tbody className="divide-y divide-line">
                {setType.items.map((item) => (
                  <tr key={item.position}>
                    <td className="px-4 py-2 tabular-nums text-muted">{item.position}</td>
                    <td className="px-4 py-2 text-ink">{item.name}</td>
                    <td className="px-4 py-2 text-right tabular-nums">{item.quantity}</td>
                  </tr>
                ))}
              </tbody>
              <tfoot className="border-t border-line-strong">
                <tr>
                  <td />
                  <th scope="row" className="px-4 py-2 text-left font-semibold">
                    Total
                  </th>
                  <td className="px-4 py-2 text-right font-semibold tabular-nums">{setType.instrumentCount}</td>
                </tr>
              </tfoot>
            </table>
          </div>
        </Card>
      </div>
    </div>
  );
}
