// GET /api/orders/bookable-sets?siteId=… — the site's sets that can be booked for pickup now
import { z } from "zod";
import { parseQuery, withAuth } from "@/lib/http/route";
import { bookableSets } from "@/lib/orders/bookable";

const querySchema = z.object({
  siteId: z.coerce.number().int().positive(),
  keepOrderId: z.coerce.number().int().positive().optional(),
});

export const GET = withAuth("orders.book", async ({ req, db, user }) => {
  const { siteId, keepOrderId } = parseQuery(req, querySchema);
  return { rows: await bookableSets(db, user, siteId, keepOrderId) };
});
