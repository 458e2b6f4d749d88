// GET /api/contracts — contract versions in the caller's scope, paged, sorted and filtered
import { listContractsQuerySchema } from "@/lib/contracts/schemas";
import { listContracts } from "@/lib/contracts/service";
import { parseQuery, withAuth } from "@/lib/http/route";

export const GET = withAuth("contracts.view", async ({ req, db, user }) => {
  const query = parseQuery(req, listContractsQuerySchema);
  return listContracts(db, user, query);
});
