import { AlertTriangle, Info } from "lucide-react";
import Image from "next/image";
import Link from "next/link";
import type { ReactNode } from "react";
import { OrderStatusBadge } from "@/components/orders/order-status-badge";
import { Badge } from "@/components/ui/badge";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { PACKAGING_LABELS, type Packaging, STERILISATION_METHOD_LABELS, type SterilisationMethod } from "@/lib/catalogue/vocabulary";
import { formatDateTime } from "@/lib/format";
import type { ProblemDetail } from "@/lib/problems/service";
import { ProblemKindBadge, ProblemStatusBadge } from "./problem-badges";

function Row({ term, children }: { term: string; children: ReactNode }) {
  return (
    <div className="grid gap-1 py-2 sm:grid-cols-[7rem_1fr] sm:gap-3">
      <dt className="text-sm text-muted">{term}</dt>
      <dd className="text-sm text-ink">{children}</dd>
    </div>
  );
}

const words = (code: string) => code.replaceAll("_", " ").replace(/^./, (c) => c.toUpperCase());

function pieces(contents: { quantity: number }[]): string {
  const n = contents.reduce((sum, c) => sum + c.quantity, 0);
  return `${n} ${n === 1 ? "piece" : "pieces"}`;
}

/** The main-line steps, whose state says it all; other events (a hold, a failed wash) are named too. */
const PLAIN_EVENTS = new Set(["book", "collect", "receive", "wash_passed", "pack", "sterilise", "release", "dispatch", "deliver"]);

/**
 * One problem: what was reported (with the photo), the set and its contents, the order, the
 * answer, and for the unit the set's trip through the stations. `answerForm` is shown while the
 * problem is open, in place of the answer.
 */
export function ProblemDetailView({
  problem,
  audience,
  timeZone,
  answerForm,
}: {
  problem: ProblemDetail;
  audience: "clinic" | "unit";
  timeZone: string;
  answerForm?: ReactNode;
}) {
  const fmt = (iso: string | null) => formatDateTime(iso, timeZone);
  const base = `/${audience}`;
  return (
    <div className="grid gap-6 lg:grid-cols-3">
      <div className="space-y-6 lg:col-span-2">
        <Card>
          <CardHeader title="What the clinic found" description={`Reported ${fmt(problem.createdAt)}${problem.reportedByName ? ` by ${problem.reportedByName}` : ""}, ${problem.siteName}`} />
          <CardBody className="space-y-4">
            <div className="flex flex-wrap items-center gap-2">
              <ProblemKindBadge kind={problem.kind} />
              <ProblemStatusBadge status={problem.status} />
            </div>
            <p className="whitespace-pre-wrap break-words text-sm leading-relaxed" data-testid="problem-description">
              {problem.description}
            </p>
            {problem.kind === "wet_or_torn_pack" && (
              <p className="flex gap-2 rounded-lg bg-warn-50 px-3 py-2 text-sm text-warn-700">
                <AlertTriangle className="mt-0.5 h-4 w-4 shrink-0" aria-hidden="true" />
                A pack that is wet, torn or open is not to be used until it has been reprocessed; follow your local procedures.
              </p>
            )}
            {problem.photo ? (
              <figure className="space-y-1">
                <a href={`/api/files/${problem.photo.id}`} target="_blank" rel="noreferrer" className="inline-block rounded-lg border border-line p-1 hover:border-lagoon-600">
                  <Image
                    src={`/api/files/${problem.photo.id}`}
                    alt={`Photo sent with problem ${problem.id}`}
                    width={640}
                    height={480}
                    unoptimized
                    loading="eager"
                    className="h-auto max-h-96 w-auto max-w-full rounded"
                    data-testid="problem-photo"
                  />
                </a>
                <figcaption className="text-xs text-muted">{problem.photo.name} · opens full size</figcaption>
              </figure>
            ) : (
              <p className="text-sm text-muted">No photo was sent.</p>
            )}
          </CardBody>
        </Card>

        <Card>
          <CardHeader title="The unit's answer" />
          <CardBody>
            {problem.answer ? (
              <div className="space-y-2" data-testid="problem-answer">
                <p className="whitespace-pre-wrap break-words text-sm leading-relaxed">{problem.answer.text}</p>
                <p className="text-xs text-muted">
                  {problem.answer.byName ? `${problem.answer.byName}, ` : ""}
                  {fmt(problem.answer.at)}
                </p>
              </div>
            ) : answerForm ? (
              <div className="space-y-4">
                <p className="flex gap-2 rounded-lg bg-lagoon-50 px-3 py-2 text-sm text-lagoon-800">
                  <Info className="mt-0.5 h-4 w-4 shrink-0" aria-hidden="true" />
                  Whether the set is quarantined, reprocessed, repaired or withdrawn is decided under the unit&apos;s validated procedures by its
                  qualified staff; this answer tells the clinic what was decided.
                </p>
                {answerForm}
              </div>
            ) : (
              <p className="text-sm text-muted">The unit has not answered yet. You will get an e-mail when it does, and the answer shows here.</p>
            )}
          </CardBody>
        </Card>

        {audience === "unit" && problem.cycle && (
          <Card>
            <CardHeader title="This trip of the set" description="Every scan and recorded step of the cycle the clinic reported on, oldest first." />
            <CardBody className="p-0">
              <div className="overflow-x-auto">
                <table className="w-full text-left text-sm">
                  <caption className="sr-only">Scan events of the cycle</caption>
                  <thead className="border-b border-line bg-paper/60 text-xs uppercase tracking-wide text-muted">
                    <tr>
                      <th scope="col" className="px-4 py-2 font-semibold">
                        When
                      </th>
                      <th scope="col" className="px-4 py-2 font-semibold">
                        Step
                      </th>
                      <th scope="col" className="px-4 py-2 font-semibold">
                        Where
                      </th>
                      <th scope="col" className="px-4 py-2 font-semibold">
                        Who
                      </th>
                    </tr>
                  </thead>
                  <tbody className="divide-y divide-line" data-testid="problem-history">
                    {problem.history.map((h) => (
                      <tr key={h.id}>
                        <td className="whitespace-nowrap px-4 py-2 tabular-nums">{fmt(h.at)}</td>
                        <td className="px-4 py-2">
                          {h.toLabel}
                          {!PLAIN_EVENTS.has(h.event) && <span className="text-xs text-muted"> · {words(h.event)}</span>}
                          {h.note && <p className="text-xs text-muted">{h.note}</p>}
                        </td>
                        <td className="px-4 py-2">{words(h.station)}</td>
                        <td className="px-4 py-2">{h.userName ?? <span className="text-muted">—</span>}</td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
            </CardBody>
          </Card>
        )}
      </div>

      <div className="space-y-6">
        <Card>
          <CardHeader title="The set" />
          <CardBody className="py-2">
            {problem.set ? (
              <>
                <dl className="divide-y divide-line">
                  <Row term="Set">
                    <Link href={`${base}/sets/${problem.set.id}`} className="font-medium text-lagoon-700 hover:underline">
                      {problem.set.serial}
                    </Link>
                  </Row>
                  <Row term="Set type">
                    <Link href={`${base}/catalogue/${problem.set.typeId}`} className="hover:underline">
                      {problem.set.typeName}
                    </Link>{" "}
                    <span className="text-muted">({problem.set.typeCode})</span>
                  </Row>
                  <Row term="Packed in">{PACKAGING_LABELS[problem.set.packaging as Packaging] ?? problem.set.packaging}</Row>
                  <Row term="Sterilised by">{STERILISATION_METHOD_LABELS[problem.set.sterilisationMethod as SterilisationMethod] ?? problem.set.sterilisationMethod}</Row>
                  {problem.cycle && (
                    <>
                      <Row term="This trip">
                        <Badge tone={problem.cycle.state === "delivered" ? "ok" : "info"}>{problem.cycle.stateLabel}</Badge>
                      </Row>
                      <Row term="Released">{fmt(problem.cycle.releasedAt)}</Row>
                      <Row term="Delivered">{fmt(problem.cycle.deliveredAt)}</Row>
                      {problem.cycle.expiresOn && <Row term="Use by">{problem.cycle.expiresOn}</Row>}
                    </>
                  )}
                </dl>
                <div className="py-3">
                  <p className="text-sm font-medium text-ink">Contents ({pieces(problem.set.contents)})</p>
                  <ol className="mt-2 space-y-1 text-sm" data-testid="problem-contents">
                    {problem.set.contents.map((c) => (
                      <li key={c.position} className="flex justify-between gap-3">
                        <span>{c.name}</span>
                        <span className="tabular-nums text-muted">× {c.quantity}</span>
                      </li>
                    ))}
                  </ol>
                </div>
              </>
            ) : (
              <p className="py-2 text-sm text-muted">About the order as a whole, not one set.</p>
            )}
          </CardBody>
        </Card>
        {problem.order && (
          <Card>
            <CardHeader title="The order" />
            <CardBody className="py-2">
              <dl className="divide-y divide-line">
                <Row term="Order">
                  <Link href={`${base}/orders/${problem.order.id}`} className="font-medium text-lagoon-700 hover:underline">
                    {problem.order.reference}
                  </Link>
                </Row>
                <Row term="Status">
                  <OrderStatusBadge status={problem.order.status} />
                </Row>
                {audience === "unit" && <Row term="Customer">{problem.organisationName}</Row>}
                <Row term="Site">{problem.siteName}</Row>
              </dl>
            </CardBody>
          </Card>
        )}
      </div>
    </div>
  );
}
