// GET /api/sites — sites in the caller's scope
import { z } from "zod";
import { parseQuery, withAuth } from "@/lib/http/route";
import { listSites } from "@/lib/sites/queries";

const querySchema = z.object({ organisationId: z.coerce.number().int().positive().optional() });

export const GET = withAuth("sites.view", async ({ req, db, user }) => {
  const query = parseQuery(req, querySchema);
  return { rows: await listSites(db, user, query) };
});
