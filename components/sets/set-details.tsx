import type { ReactNode } from "react";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import {
  isSetClass,
  PACKAGING_LABELS,
  type Packaging,
  SET_CLASS_LABELS,
  STERILISATION_METHOD_LABELS,
  type SterilisationMethod,
} from "@/lib/catalogue/vocabulary";
import { formatDateTime } from "@/lib/format";
import { contentsSummary } from "@/lib/sets/label-layout";
import type { SetAuditEntry, SetContentsLine, SetView } from "@/lib/sets/service";
import { SetStatusBadge } from "./status-badge";

function Row({ term, children }: { term: string; children: ReactNode }) {
  return (
    <div className="grid gap-1 py-2.5 sm:grid-cols-[11rem_1fr] sm:gap-4">
      <dt className="text-sm text-muted">{term}</dt>
      <dd className="text-sm text-ink">{children}</dd>
    </div>
  );
}

/** The set's card: what it is, whose it is, how it is identified. */
export function SetDetails({ set, showCustomer }: { set: SetView; showCustomer: boolean }) {
  const packaging = PACKAGING_LABELS[set.packaging as Packaging] ?? set.packaging;
  const method = STERILISATION_METHOD_LABELS[set.sterilisationMethod as SterilisationMethod] ?? set.sterilisationMethod;
  return (
    <Card>
      <CardHeader title="This set" />
      <CardBody className="py-2">
        <dl className="divide-y divide-line">
          <Row term="Set type">
            <span className="font-medium">{set.setTypeName}</span> <span className="text-muted">({set.setTypeCode})</span>
            {!set.setTypeActive && <span className="ml-2 text-xs text-warn-700">withdrawn from the catalogue</span>}
          </Row>
          <Row term="Class">{isSetClass(set.setClass) ? SET_CLASS_LABELS[set.setClass] : set.setClass}</Row>
          <Row term="Contents">{contentsSummary(set.contentsInstruments, set.contentsLines)}</Row>
          <Row term="Packed in">{packaging}</Row>
          <Row term="Sterilised by">{method}</Row>
          {showCustomer && <Row term="Customer">{set.organisationName}</Row>}
          <Row term="Home site">{set.homeSiteName}</Row>
          <Row term="Serial">
            <span className="font-semibold tabular-nums">{set.serial}</span>
          </Row>
          <Row term="GS1 identifier (GIAI)">
            <span className="break-all font-mono" data-testid="set-giai">
              {set.humanReadable}
            </span>
          </Row>
          <Row term="Status">
            <SetStatusBadge status={set.status} />
          </Row>
          <Row term="Added">{formatDateTime(set.createdAt)}</Row>
          {set.updatedAt !== set.createdAt && <Row term="Last changed">{formatDateTime(set.updatedAt)}</Row>}
        </dl>
      </CardBody>
    </Card>
  );
}

/** The set type's contents list, as the set should hold it. */
export function SetContents({ contents }: { contents: SetContentsLine[] }) {
  return (
    <Card>
      <CardHeader title="Contents" description="From the set type's entry in the catalogue." />
      <CardBody>
        {contents.length === 0 ? (
          <p className="text-sm text-muted">The catalogue has no contents list for this set type yet.</p>
        ) : (
          <ol className="space-y-1 text-sm">
            {contents.map((line) => (
              <li key={line.position} className="flex gap-3">
                <span className="w-8 shrink-0 text-right tabular-nums text-muted">{line.quantity} ×</span>
                <span>{line.name}</span>
              </li>
            ))}
          </ol>
        )}
      </CardBody>
    </Card>
  );
}

const ACTION_LABELS: Record<string, string> = {
  "set.created": "Added",
  "set.retired": "Retired",
  "set.returned_to_service": "Returned to service",
};

/** What was recorded about the set: who did what, when, and why. */
export function SetHistory({ entries }: { entries: SetAuditEntry[] }) {
  return (
    <Card>
      <CardHeader title="Recorded changes" description="From the audit log, oldest first." />
      <CardBody>
        {entries.length === 0 ? (
          <p className="text-sm text-muted">Nothing has been recorded about this set since it was added.</p>
        ) : (
          <ol className="space-y-3">
            {entries.map((entry) => (
              <li key={entry.id} className="text-sm">
                <p>
                  <span className="font-medium text-ink">{ACTION_LABELS[entry.action] ?? entry.action}</span>
                  <span className="text-muted">
                    {" "}
                    · {formatDateTime(entry.at)}
                    {entry.actorName ? ` · ${entry.actorName}` : ""}
                  </span>
                </p>
                {typeof entry.details.reason === "string" && <p className="mt-0.5 text-ink-soft">{entry.details.reason}</p>}
              </li>
            ))}
          </ol>
        )}
      </CardBody>
    </Card>
  );
}
