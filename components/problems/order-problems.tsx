import Link from "next/link";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { getDb } from "@/db";
import { can } from "@/lib/auth/permissions";
import type { SessionUser } from "@/lib/auth/session-user";
import { formatDateTime } from "@/lib/format";
import type { OrderDetail } from "@/lib/orders/service";
import { PROBLEM_KIND_SHORT } from "@/lib/problems/schemas";
import { listOrderProblems } from "@/lib/problems/service";
import { ProblemStatusBadge } from "./problem-badges";
import { ReportProblemDialog } from "./report-problem-dialog";

/** The clinic order page's problems: what was reported on this order, the unit's answers, and the report button. */
export async function OrderProblems({ user, order, timeZone }: { user: SessionUser; order: OrderDetail; timeZone: string }) {
  const problems = await listOrderProblems(getDb(), user, order.id);
  const sets = order.cycles
    .filter((c) => c.state !== "cancelled")
    .map((c) => ({
      cycleId: c.cycleId,
      label: `${c.serial} — ${c.setName}`,
      delivered: c.times.some((t) => t.state === "delivered"),
      stateLabel: c.stateLabel,
    }));
  const canReport = can(user.role, "problems.report") && order.status !== "cancelled";
  if (!canReport && problems.length === 0) return null;
  return (
    <Card className="mt-6">
      <CardHeader
        title={`Problems reported (${problems.length})`}
        description="A missing or damaged instrument, a wet or torn pack, the wrong set: tell the unit here."
        action={canReport ? <ReportProblemDialog orderId={order.id} reference={order.reference} sets={sets} /> : undefined}
      />
      <CardBody className="p-0">
        {problems.length === 0 ? (
          <p className="px-5 py-4 text-sm text-muted">Nothing reported on this order.</p>
        ) : (
          <ul className="divide-y divide-line">
            {problems.map((p) => (
              <li key={p.id} className="space-y-2 px-5 py-4" data-testid="order-problem">
                <div className="flex flex-wrap items-center justify-between gap-2">
                  <p className="font-medium">
                    <Link href={`/clinic/problems/${p.id}`} className="text-lagoon-700 hover:underline">
                      Problem {p.id}
                    </Link>{" "}
                    · {PROBLEM_KIND_SHORT[p.kind]}
                    {p.setSerial && <span className="font-normal text-muted"> · {p.setSerial}</span>}
                  </p>
                  <ProblemStatusBadge status={p.status} />
                </div>
                <p className="whitespace-pre-wrap break-words text-sm">{p.description}</p>
                <p className="text-xs text-muted">
                  Reported {formatDateTime(p.createdAt, timeZone)}
                  {p.reportedByName ? ` by ${p.reportedByName}` : ""}
                  {p.hasPhoto ? " · with a photo" : ""}
                </p>
                {p.status === "open" && <p className="text-sm font-medium text-warn-700">Waiting for the unit&apos;s answer.</p>}
                {p.answer && (
                  <div className="rounded-lg border border-lagoon-200 bg-lagoon-50 px-3 py-2 text-sm" data-testid="order-problem-answer">
                    <p className="text-xs font-medium text-lagoon-800">
                      The unit answered {formatDateTime(p.answeredAt, timeZone)}
                      {p.answeredByName ? ` (${p.answeredByName})` : ""}
                    </p>
                    <p className="mt-1 whitespace-pre-wrap break-words">{p.answer}</p>
                  </div>
                )}
              </li>
            ))}
          </ul>
        )}
      </CardBody>
    </Card>
  );
}
