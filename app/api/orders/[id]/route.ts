// GET /api/orders/:id — one order with each set's cycle states and times (404 for another tenant's)
import { parseId, withAuth } from "@/lib/http/route";
import { getOrderDetail } from "@/lib/orders/service";

export const GET = withAuth<{ id: string }>("orders.view", async ({ db, user, params }) => {
  return getOrderDetail(db, user, parseId(params.id, "That order"));
});
