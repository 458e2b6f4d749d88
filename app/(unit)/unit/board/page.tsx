import type { Metadata } from "next";
import { BoardView } from "@/components/board/board-view";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { getUnitBoard } from "@/lib/board/service";
import { serverEnv } from "@/lib/env";

export const metadata: Metadata = { title: "Unit board" };

// The unit's board: rendered on the server, then kept fresh in the browser.
export default async function BoardPage() {
  const user = await requirePermission("board.view");
  const board = await getUnitBoard(getDb(), user);
  return (
    <>
      <PageHeader title="Unit board" description="Where every set is now, what is overdue and what is on hold. Made to be read from across the room." />
      <BoardView initial={board} timeZone={serverEnv().UNIT_TIME_ZONE} />
    </>
  );
}
