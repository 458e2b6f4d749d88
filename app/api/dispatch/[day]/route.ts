// GET /api/dispatch/:day — the day's plan: runs per van, their stops and sets, stops off the runs
import { daySchema } from "@/lib/dispatch/schemas";
import { getDispatchDay } from "@/lib/dispatch/view";
import { AppError } from "@/lib/errors";
import { withAuth } from "@/lib/http/route";

export const GET = withAuth<{ day: string }>("routes.view", async ({ db, params }) => {
  const day = daySchema.safeParse(params.day);
  if (!day.success) throw new AppError("not_found", "There is no plan for that day.");
  const view = await getDispatchDay(db, day.data);
  if (!view.plan) throw new AppError("not_found", "There is no plan for that day.");
  return view;
});
