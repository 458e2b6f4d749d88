// GET /api/batches/:id/record.pdf — the washer batch's one-page cycle record
import { renderCycleRecordPdf } from "@/lib/cycles/record-pdf";
import { serverEnv } from "@/lib/env";
import { parseId, withAuth } from "@/lib/http/route";
import { batchRecordSheet } from "@/lib/washing/record-sheet";

export const GET = withAuth<{ id: string }>("machines.view", async ({ db, user, params }) => {
  const sheet = await batchRecordSheet(db, user, parseId(params.id, "That washer batch"), serverEnv().UNIT_TIME_ZONE);
  const pdf = await renderCycleRecordPdf(sheet);
  return new Response(new Uint8Array(pdf), {
    headers: {
      "content-type": "application/pdf",
      "content-length": String(pdf.length),
      "content-disposition": `attachment; filename="batch-${sheet.number.replace(/[^A-Za-z0-9._-]+/g, "-")}-record.pdf"`,
      "x-content-type-options": "nosniff",
      "cache-control": "private, no-store",
    },
  });
});
