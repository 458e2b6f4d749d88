// GET /api/orders — the caller's orders, paged and filtered (status, site, dates, search)
import { parseQuery, withAuth } from "@/lib/http/route";
import { listOrdersQuerySchema } from "@/lib/orders/schemas";
import { listOrders } from "@/lib/orders/service";

export const GET = withAuth("orders.view", async ({ req, db, user }) => {
  return listOrders(db, user, parseQuery(req, listOrdersQuerySchema));
});
