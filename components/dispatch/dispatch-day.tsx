import { FileDown, Printer } from "lucide-react";
import Link from "next/link";
import { Badge } from "@/components/ui/badge";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import type { DispatchDayView, PlanRunView, PlanStopView } from "@/lib/dispatch/view";
import { formatDateTime } from "@/lib/format";
import { PlanActions } from "./plan-actions";
import { PlanAdvisory } from "./plan-advisory";
import { RunMap, runStyle } from "./run-map";
import { ShiftsPanel } from "./shifts-panel";
import { StopControls, type VanChoice } from "./stop-controls";

type RunChoice = VanChoice & { runId: number };

const KIND_LABEL: Record<PlanStopView["kind"], string> = { collection: "Collect", delivery: "Deliver", both: "Collect + deliver" };

function CartUse({ label, used, capacity }: { label: string; used: number; capacity: number }) {
  const over = used > capacity;
  return (
    <span className={over ? "font-semibold text-danger-700" : ""}>
      {label} {used}/{capacity}
      {over ? " — over capacity" : ""}
    </span>
  );
}

function StopRow({ stop, count, vans, canPlan }: { stop: PlanStopView; count: number; vans: RunChoice[]; canPlan: boolean }) {
  const vanId = vans.find((v) => v.runId === stop.runId)?.vanId ?? null;
  return (
    <li className="grid gap-2 border-t border-line py-3 first:border-t-0 md:grid-cols-[2.5rem_minmax(0,1fr)_auto] md:items-start" data-testid="plan-stop">
      <span className="text-lg font-semibold tabular-nums text-ink-soft">{stop.position ?? "–"}</span>
      <div className="space-y-1 text-sm">
        <p className="font-medium text-ink">
          {stop.siteName} <span className="font-normal text-muted">· {stop.organisationName}</span>
        </p>
        <p className="flex flex-wrap gap-x-3 gap-y-1 text-ink-soft">
          <Badge tone={stop.kind === "collection" ? "neutral" : "info"}>{KIND_LABEL[stop.kind]}</Badge>
          <span>
            Window {stop.window}
            {stop.hard ? "" : " (soft)"}
          </span>
          {stop.start && <span>Planned {stop.start}{stop.arrival && stop.arrival !== stop.start ? ` (arrives ${stop.arrival}, waits)` : ""}</span>}
          <span>{stop.serviceMin} min on site</span>
          <span>
            Carts: soiled {stop.soiledCarts}, clean {stop.cleanCarts}
          </span>
          {stop.locked && <Badge tone="warn">Locked</Badge>}
          {stop.notifiedAt && <span className="text-muted">Site told {formatDateTime(stop.notifiedAt)}</span>}
        </p>
        <p className="text-xs text-muted">
          {stop.orders.map((o) => `${o.role === "collect" ? "Collect" : "Deliver"} ${o.reference}`).join(" · ")} — {stop.collect.length} to collect, {stop.deliver.length} to deliver
        </p>
        {stop.lateMin > 0 && <p className="text-sm font-medium text-danger-700">Late: service starts {stop.lateMin} min after the window closes at {stop.window.split("–")[1]}.</p>}
        {stop.reason && <p className="text-sm font-medium text-danger-700">Not on a run: {stop.reason}</p>}
        {stop.note && <p className="text-xs text-ink-soft">{stop.note}</p>}
      </div>
      {canPlan && stop.status === "planned" && (
        <StopControls stopId={stop.id} vanId={vanId} position={stop.position} count={count} locked={stop.locked} vans={vans} siteName={stop.siteName} />
      )}
    </li>
  );
}

function RunCard({ run, index, day, vans, canPlan }: { run: PlanRunView; index: number; day: string; vans: RunChoice[]; canPlan: boolean }) {
  const style = runStyle(index);
  return (
    <Card data-testid="plan-run">
      <CardHeader
        title={`Van ${run.vanCode} · ${run.driverName}`}
        description={`${run.vanName}, ${run.registration} · shift ${run.shift} · line: ${style.label}`}
        action={
          run.stops.length > 0 ? (
            <div className="flex gap-2 text-sm">
              <Link href={`/unit/dispatch/${day}/manifest/${run.vanId}`} className="inline-flex items-center gap-1 text-lagoon-700 hover:underline">
                <Printer className="h-4 w-4" aria-hidden="true" /> Manifest
              </Link>
              <a href={`/api/dispatch/${day}/manifest/${run.vanId}`} className="inline-flex items-center gap-1 text-lagoon-700 hover:underline">
                <FileDown className="h-4 w-4" aria-hidden="true" /> PDF
              </a>
            </div>
          ) : undefined
        }
      />
      <CardBody className="space-y-2">
        <p className="flex flex-wrap gap-x-4 gap-y-1 text-sm text-ink-soft">
          <span>{run.stops.length} stops</span>
          <span>{run.distanceKm.toFixed(1)} km</span>
          <span>{run.driveMin} min driving</span>
          {run.leave && (
            <span>
              Leaves {run.leave}, back {run.back}
            </span>
          )}
          <CartUse label="Soiled carts" used={run.soiledCarts} capacity={run.soiledCapacity} />
          <CartUse label="Clean carts" used={run.cleanCarts} capacity={run.cleanCapacity} />
        </p>
        {run.stops.length === 0 ? (
          <p className="text-sm text-muted">No stops on this van.</p>
        ) : (
          <ol>
            {run.stops.map((s) => (
              <StopRow key={s.id} stop={s} count={run.stops.length} vans={vans} canPlan={canPlan} />
            ))}
          </ol>
        )}
      </CardBody>
    </Card>
  );
}

/** The dispatcher's day: shifts, the plan's runs with their stops, the picture, and what could not be planned. */
export function DispatchDay({ view, drivers, canPlan }: { view: DispatchDayView; drivers: { id: number; name: string }[]; canPlan: boolean }) {
  const plan = view.plan;
  const vans: RunChoice[] = (plan?.runs ?? []).map((r) => ({ vanId: r.vanId, runId: r.id, label: `Van ${r.vanCode} (${r.driverName.split(" ")[0]})` }));
  const summary = plan?.summary;
  return (
    <div className="space-y-6">
      <PlanAdvisory />
      <div className="flex flex-wrap items-center justify-between gap-3">
        <div className="flex flex-wrap items-center gap-2 text-sm text-ink-soft">
          {plan ? (
            <>
              <Badge tone={plan.status === "published" ? "ok" : "warn"}>{plan.status === "published" ? "Published" : "Draft"}</Badge>
              {plan.solvedAt && <span>Planned {formatDateTime(plan.solvedAt)}</span>}
              {plan.publishedAt && <span>· last published {formatDateTime(plan.publishedAt)}</span>}
              {plan.status === "draft" && plan.publishedAt && <span className="font-medium text-warn-700">· changed since publishing: drivers and sites see the old times until you publish</span>}
            </>
          ) : (
            <span>No plan for this day yet.</span>
          )}
        </div>
        {canPlan && <PlanActions day={view.day} seed={plan?.seed ?? 1} hasPlan={!!plan && plan.runs.some((r) => r.stops.length > 0)} status={plan?.status ?? null} />}
      </div>

      {summary && (
        <Card>
          <CardBody className="flex flex-wrap gap-x-6 gap-y-2 text-sm">
            <span>
              <strong className="text-ink">{summary.totals.assigned}</strong> of {summary.totals.stops} stops on {summary.totals.vans} van(s)
            </span>
            <span>
              <strong className="text-ink">{summary.totals.distanceKm.toFixed(1)}</strong> km
            </span>
            <span>
              <strong className="text-ink">{summary.totals.driveMin}</strong> min driving
            </span>
            <span className={summary.totals.lateMin > 0 ? "font-medium text-danger-700" : ""}>{summary.totals.lateMin} min late in all</span>
            {summary.search && (
              <span className="text-muted">
                Seed {summary.search.seed}, {summary.search.iterations} rounds in {(summary.search.elapsedMs / 1000).toFixed(1)} s
              </span>
            )}
          </CardBody>
        </Card>
      )}

      {summary && (summary.violations.length > 0 || summary.warnings.length > 0 || summary.infeasible.length > 0) && (
        <Card>
          <CardHeader title="Needs your attention" />
          <CardBody>
            <ul className="list-disc space-y-1 pl-5 text-sm">
              {summary.violations.map((v, i) => (
                <li key={`v${i}`} className="text-danger-700">
                  {v.message}
                </li>
              ))}
              {summary.warnings.map((w, i) => (
                <li key={`w${i}`} className="text-warn-700">
                  {w}
                </li>
              ))}
              {summary.infeasible.map((u, i) => (
                <li key={`i${i}`}>{u.reason}</li>
              ))}
            </ul>
          </CardBody>
        </Card>
      )}

      <div className="grid gap-6 xl:grid-cols-2">
        {plan && (
          <Card>
            <CardHeader title="The runs" />
            <CardBody>
              <RunMap runs={plan.runs} unassigned={plan.unassigned} depot={view.depot} />
            </CardBody>
          </Card>
        )}
        <Card>
          <CardHeader title="Drivers' shifts" description="Each driver with a van and a shift is one run. Times are the unit's local time." />
          <CardBody>
            <ShiftsPanel day={view.day} shifts={view.shifts} drivers={drivers} vans={view.vans} canEdit={canPlan} />
          </CardBody>
        </Card>
      </div>

      <div className="space-y-4">
        {plan && plan.unassigned.length > 0 && (
          <Card data-testid="plan-unassigned">
            <CardHeader title="Not on a run" description="Each stop says why; move it to a van by hand or plan again after changing shifts." />
            <CardBody>
              <ol>
                {plan.unassigned.map((s) => (
                  <StopRow key={s.id} stop={s} count={0} vans={vans} canPlan={canPlan} />
                ))}
              </ol>
            </CardBody>
          </Card>
        )}
        {plan?.runs.map((run, i) => <RunCard key={run.id} run={run} index={i} day={view.day} vans={vans} canPlan={canPlan} />)}
      </div>
    </div>
  );
}
