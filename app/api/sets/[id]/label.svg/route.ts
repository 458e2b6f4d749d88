// GET /api/sets/:id/label.svg — the set's GS1 DataMatrix symbol as SVG (404 outside the caller's scope)
import { parseId, withAuth } from "@/lib/http/route";
import { setSymbolSvg } from "@/lib/sets/label";
import { getSet } from "@/lib/sets/service";

export const GET = withAuth<{ id: string }>("sets.view", async ({ db, user, params }) => {
  const set = await getSet(db, user, parseId(params.id, "That set"));
  return new Response(setSymbolSvg(set.giai), {
    headers: {
      "content-type": "image/svg+xml; charset=utf-8",
      "content-disposition": `inline; filename="datamatrix-${set.serial}.svg"`,
      "x-content-type-options": "nosniff",
      "cache-control": "private, max-age=0, must-revalidate",
    },
  });
});
