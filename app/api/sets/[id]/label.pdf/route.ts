// GET /api/sets/:id/label.pdf[?contents=1][&cycle=<id>] — the set's label as a PDF for a label printer, for its current (or the named) cycle
import { assertCan } from "@/lib/auth/permissions";
import { parseId, parseQuery, withAuth } from "@/lib/http/route";
import { getSetLabel, labelPrintQuerySchema, renderSetLabelPdf } from "@/lib/sets/label";

// The set is looked up in the caller's scope first, so another tenant's set answers 404 before
// the printing permission is asked for.
export const GET = withAuth<{ id: string }>("sets.view", async ({ req, db, user, params }) => {
  const id = parseId(params.id, "That set");
  const { contents, cycle } = parseQuery(req, labelPrintQuerySchema);
  const label = await getSetLabel(db, user, id, { cycleId: cycle });
  assertCan(user, "labels.print");
  const pdf = await renderSetLabelPdf(label, { withContents: contents === "1" });
  return new Response(new Uint8Array(pdf), {
    headers: {
      "content-type": "application/pdf",
      "content-length": String(pdf.length),
      "content-disposition": `attachment; filename="label-${label.set.serial}.pdf"`,
      "x-content-type-options": "nosniff",
      "cache-control": "private, no-store",
    },
  });
});
