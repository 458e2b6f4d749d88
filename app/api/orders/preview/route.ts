// POST /api/orders/preview — what a booking would give: promised return, problems, price estimate; writes nothing
import { withAuth } from "@/lib/http/route";
import { assessBooking } from "@/lib/orders/assess";
import { bookingSchema } from "@/lib/orders/schemas";
import { z } from "zod";

const previewSchema = bookingSchema.safeExtend({ ignoreOrderId: z.coerce.number().int().positive().optional() });

export const POST = withAuth("orders.book", async ({ req, db, user }) => {
  const { ignoreOrderId, ...input } = previewSchema.parse(await req.json());
  const a = await assessBooking(db, user, input, new Date(), { ignoreOrderId });
  return {
    problems: a.problems,
    outOfHours: a.outOfHours,
    plan: a.plan && {
      promisedAt: a.plan.promisedAt.toISOString(),
      meetsNeededBy: a.plan.meetsNeededBy,
      earliestStandard: a.plan.earliestStandard.toISOString(),
      earliestExpress: a.plan.earliestExpress.toISOString(),
      suggestion: a.plan.suggestion.kind,
      suggestionMessage: a.plan.suggestion.message,
    },
    quote: a.quote,
    sets: a.sets,
  };
});
