// GET /api/set-types — set types of a customer's catalogue (clinic users: always their own), paged and filtered
import { listSetTypesQuerySchema } from "@/lib/catalogue/schemas";
import { listSetTypes } from "@/lib/catalogue/set-types";
import { parseQuery, withAuth } from "@/lib/http/route";

export const GET = withAuth("catalogue.view", async ({ req, db, user }) => {
  return listSetTypes(db, user, parseQuery(req, listSetTypesQuerySchema));
});
