// GET /api/sets/:id/label.pdf[?contents=1] — the set's label as a PDF for a label printer
import { assertCan } from "@/lib/auth/permissions";
import { parseId, parseQuery, withAuth } from "@/lib/http/route";
import { getSetLabel, renderSetLabelPdf } from "@/lib/sets/label";
import { labelQuerySchema } from "@/lib/sets/schemas";

// The set is looked up in the caller's scope first, so another tenant's set answers 404 before
// the printing permission is asked for.
export const GET = withAuth<{ id: string }>("sets.view", async ({ req, db, user, params }) => {
  const id = parseId(params.id, "That set");
  const { contents } = parseQuery(req, labelQuerySchema);
  const label = await getSetLabel(db, user, id);
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
