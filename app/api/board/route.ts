// GET /api/board — the unit's board now: sets per station, overdue, on hold, by customer and service level
import { getUnitBoard } from "@/lib/board/service";
import { withAuth } from "@/lib/http/route";

export const GET = withAuth("board.view", async ({ db, user }) => getUnitBoard(db, user));
