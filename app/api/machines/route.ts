// GET /api/machines — the unit's machines of every kind, with their program counts and open batch
import { z } from "zod";
import { parseQuery, withAuth } from "@/lib/http/route";
import { MACHINE_KINDS } from "@/lib/machines/requirements";
import { listMachines } from "@/lib/machines/service";

const querySchema = z.object({ kind: z.enum(MACHINE_KINDS).optional(), active: z.enum(["yes"]).optional() });

export const GET = withAuth("machines.view", async ({ req, db }) => {
  const query = parseQuery(req, querySchema);
  return { machines: await listMachines(db, { kind: query.kind, activeOnly: query.active === "yes" }) };
});
