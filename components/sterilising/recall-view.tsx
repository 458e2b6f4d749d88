import { Download, FileText } from "lucide-react";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { formatDateTime } from "@/lib/format";
import type { RecallView } from "@/lib/sterilising/recalls";
import { RecallReturnButton } from "./recall-return-button";
import { ReleaseAdvisory } from "./release-advisory";

/** A recall: the affected customers, each set with where it is now and the procedures that used it. */
export function RecallDetails({ recall, canManage, showMail }: { recall: RecallView; canManage: boolean; showMail: boolean }) {
  return (
    <div className="space-y-6">
      <ReleaseAdvisory kind="recall" />
      <Card>
        <CardHeader
          title={`Recall ${recall.number}`}
          description={`Load ${recall.load.number} on ${recall.load.machineCode} · raised ${formatDateTime(recall.createdAt)}${recall.createdBy ? ` by ${recall.createdBy}` : ""}`}
          action={
            <div className="flex gap-2">
              <Button variant="secondary" size="sm" asChild>
                <a href={`/api/recalls/${recall.id}/report.csv`}>
                  <Download className="h-4 w-4" aria-hidden="true" /> CSV
                </a>
              </Button>
              <Button variant="secondary" size="sm" asChild>
                <a href={`/api/recalls/${recall.id}/report.pdf`}>
                  <FileText className="h-4 w-4" aria-hidden="true" /> PDF
                </a>
              </Button>
            </div>
          }
        />
        <CardBody className="space-y-3 text-sm">
          <p>
            <Badge tone={recall.status === "open" ? "danger" : "ok"}>{recall.status === "open" ? "Open" : "Closed: every set is back"}</Badge>
          </p>
          <p>
            <span className="text-muted">Reason: </span>
            {recall.reason}
          </p>
          <ul className="grid gap-2 sm:grid-cols-2" data-testid="recall-customers">
            {recall.customers.map((c) => (
              <li key={c.organisationId} className="rounded-lg border border-line p-3">
                <p className="font-semibold text-ink">{c.name}</p>
                <p className="text-muted">
                  {c.sets} set{c.sets === 1 ? "" : "s"} · {c.outstanding} not back yet
                </p>
              </li>
            ))}
          </ul>
          {showMail && recall.mails.length > 0 && (
            <p className="text-muted">
              E-mailed: {recall.mails.map((m) => `${m.to} (${m.status === "sent" ? `sent ${formatDateTime(m.sentAt)}` : m.status})`).join("; ")}
            </p>
          )}
        </CardBody>
      </Card>
      <Card>
        <CardHeader title="Sets" />
        <ul className="divide-y divide-line" data-testid="recall-items">
          {recall.items.map((i) => (
            <li key={i.cycleId} className="space-y-1 px-5 py-3 text-sm">
              <div className="flex flex-wrap items-center justify-between gap-3">
                <p>
                  <span className="font-semibold text-ink">{i.serial}</span> · {i.setTypeName} · <span className="text-muted">{i.organisationName}, {i.siteName}</span>
                </p>
                <div className="flex items-center gap-2">
                  <span className="text-muted">at recall: {i.stateAtRecall}</span>
                  <Badge tone={i.returnedAt ? "ok" : "danger"}>{i.returnedAt ? `Back ${formatDateTime(i.returnedAt)}` : `Now: ${i.stateLabel}`}</Badge>
                  {canManage && !i.returnedAt && <RecallReturnButton recallId={recall.id} cycleId={i.cycleId} serial={i.serial} />}
                </div>
              </div>
              {i.procedures.length > 0 ? (
                <ul className="pl-4 text-ink-soft" data-testid="recall-procedures">
                  {i.procedures.map((p) => (
                    <li key={`${p.caseReference}-${p.usedAt}`}>
                      Used in {p.theatre}, case {p.caseReference}, {formatDateTime(p.usedAt)}
                    </li>
                  ))}
                </ul>
              ) : (
                <p className="pl-4 text-muted">No procedure recorded with this set.</p>
              )}
            </li>
          ))}
        </ul>
      </Card>
    </div>
  );
}
