// GET /api/files/:id — an uploaded file, if the caller may see it (404 otherwise)
import { parseId, withAuth } from "@/lib/http/route";
import { readFileFor } from "@/lib/storage/files";

export const GET = withAuth<{ id: string }>("files.view", async ({ db, user, params }) => {
  const { file, bytes } = await readFileFor(db, user, parseId(params.id, "That file"));
  const inline = file.content_type === "application/pdf" || file.content_type.startsWith("image/");
  return new Response(new Uint8Array(bytes), {
    headers: {
      "content-type": file.content_type,
      "content-length": String(bytes.length),
      "content-disposition": `${inline ? "inline" : "attachment"}; filename*=UTF-8''${encodeURIComponent(file.original_name)}`,
      "x-content-type-options": "nosniff",
      "cache-control": "private, max-age=0, must-revalidate",
      etag: `"${file.sha256}"`,
    },
  });
});
