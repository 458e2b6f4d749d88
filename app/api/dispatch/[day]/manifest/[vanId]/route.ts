// GET /api/dispatch/:day/manifest/:vanId — one van's manifest for the day as a PDF
import { manifestPdf } from "@/lib/dispatch/manifest-pdf";
import { daySchema } from "@/lib/dispatch/schemas";
import { getManifest } from "@/lib/dispatch/view";
import { AppError } from "@/lib/errors";
import { parseId, withAuth } from "@/lib/http/route";

export const GET = withAuth<{ day: string; vanId: string }>("routes.view", async ({ db, params }) => {
  const day = daySchema.safeParse(params.day);
  if (!day.success) throw new AppError("not_found", "There is no plan for that day.");
  const manifest = await getManifest(db, day.data, parseId(params.vanId, "That van"));
  const pdf = await manifestPdf(manifest);
  return new Response(new Uint8Array(pdf), {
    headers: {
      "content-type": "application/pdf",
      "content-length": String(pdf.length),
      "content-disposition": `attachment; filename="manifest-${manifest.day}-${manifest.run.vanCode}.pdf"`,
      "x-content-type-options": "nosniff",
      "cache-control": "private, no-store",
    },
  });
});
