import "server-only";
import type { Kysely, Selectable, Transaction } from "kysely";
import type { Database, MachinesTable } from "@/db/schema";
import { AppError, notFound } from "@/lib/errors";
import { formatDateTime } from "@/lib/format";
import { openFaultOf } from "@/lib/monitoring/service";
import type { RunMachineKind } from "./station-machines";

// Whether a washer or steriliser may take a run now: it is of the expected kind, switched on, and
// has no open fault in the monitoring log. Opening a batch or load checks it, and so does
// starting one, since a fault may be recorded while the run is still being loaded.

type Db = Kysely<Database> | Transaction<Database>;

const WORDS: Record<RunMachineKind, { machine: string; run: string }> = {
  washer: { machine: "washer", run: "batch" },
  steriliser: { machine: "steriliser", run: "load" },
};

/**
 * The machine if a run may be opened (or, given `starting`, started) on it now; otherwise an
 * AppError that names the machine and says what to do: 404 when it is missing or of another
 * kind, a conflict when it is switched off or out of use with an open fault.
 */
export async function requireUsableMachine(
  db: Db,
  machineId: number,
  kind: RunMachineKind,
  starting?: { number: string },
): Promise<Selectable<MachinesTable>> {
  const { machine: noun, run } = WORDS[kind];
  const machine = await db.selectFrom("machines").selectAll().where("id", "=", machineId).executeTakeFirst();
  if (!machine || machine.kind !== kind) throw notFound(`That ${noun}`);
  if (machine.active !== 1) {
    throw new AppError(
      "conflict",
      starting
        ? `${machine.code} is switched off, so ${run} ${starting.number} cannot be started: switch it on again on the machine's page, or take the sets out and use another ${noun}.`
        : `${machine.code} is switched off; choose another ${noun}.`,
    );
  }
  const fault = await openFaultOf(db, machine.id);
  if (fault) {
    const recorded = `${machine.code} is out of use with a fault recorded ${formatDateTime(fault.at)}`;
    throw new AppError(
      "conflict",
      starting
        ? `${recorded}; ${run} ${starting.number} cannot be started until the fault is cleared in the monitoring log. Wait for that, or take the sets out and use another ${noun}.`
        : `${recorded}; choose another ${noun} until the fault is cleared in the monitoring log.`,
    );
  }
  return machine;
}
