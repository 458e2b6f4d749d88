import type { LucideIcon } from "lucide-react";
import type { ReactNode } from "react";
import { Card, CardBody } from "@/components/ui/card";
import { capitalise, type MachineNoun, type OpenRunSummary, type RunNoun, type StationMachine } from "./run-kind";

/**
 * The first screen of a batch-style station: one big button per machine that is switched on,
 * with its open run (status, number, sets) or "Free".
 */
export function MachinePicker<M extends StationMachine, Status extends string>({
  machines,
  noun,
  machineNoun,
  icon: Icon,
  gridClassName,
  emptyText,
  busy,
  onChoose,
  openRunOf,
  statusBadge,
  nameSuffix,
  details,
  testIdOf,
}: {
  machines: M[];
  noun: RunNoun;
  machineNoun: MachineNoun;
  icon: LucideIcon;
  /** The columns of the grid of machines from the small breakpoint up. */
  gridClassName: string;
  /** Shown instead of the grid when no machine of the kind is switched on. */
  emptyText: string;
  busy: boolean;
  onChoose: (machine: M) => void;
  openRunOf: (machine: M) => OpenRunSummary<Status> | null;
  statusBadge: (status: Status) => ReactNode;
  /** Follows the machine's name on its button, e.g. " · 8 StU". */
  nameSuffix?: (machine: M) => string;
  /** Between the name and the open run, e.g. the day's test. */
  details?: (machine: M) => ReactNode;
  testIdOf?: (machine: M) => string;
}) {
  if (machines.length === 0) {
    return (
      <Card>
        <CardBody className="py-10 text-center text-lg text-muted">{emptyText}</CardBody>
      </Card>
    );
  }
  const headingId = `${machineNoun}s-heading`;
  return (
    <section aria-labelledby={headingId} className="space-y-3">
      <h2 id={headingId} className="text-lg font-semibold text-ink">
        Choose the {machineNoun}
      </h2>
      <ul className={`grid gap-4 ${gridClassName}`}>
        {machines.map((m) => {
          const open = openRunOf(m);
          return (
            <li key={m.id}>
              <button
                type="button"
                disabled={busy}
                onClick={() => onChoose(m)}
                data-testid={testIdOf?.(m)}
                className="flex h-full min-h-36 w-full flex-col gap-2 rounded-card border border-line bg-surface p-5 text-left shadow-card transition-colors hover:border-lagoon-400 hover:bg-lagoon-50 focus-visible:outline-none focus-visible:ring-4 focus-visible:ring-lagoon-200"
              >
                <span className="flex items-center gap-3 text-2xl font-semibold text-ink">
                  <Icon className="h-8 w-8 text-lagoon-700" aria-hidden="true" />
                  {m.code}
                </span>
                <span className="text-base text-ink-soft">
                  {m.name}
                  {nameSuffix?.(m)}
                </span>
                {details?.(m)}
                {open ? (
                  <span className="mt-auto text-base">
                    {statusBadge(open.status)} {capitalise(noun)} {open.number} · {open.itemCount} set{open.itemCount === 1 ? "" : "s"}
                  </span>
                ) : (
                  <span className="mt-auto text-base text-muted">Free: open a new {noun}</span>
                )}
              </button>
            </li>
          );
        })}
      </ul>
    </section>
  );
}
