// POST /api/set-types/import/check — dry run of a catalogue CSV (multipart: file, organisationId): every problem and what would change; writes nothing
import { checkImport, readImportUpload } from "@/lib/catalogue/import-service";
import { withAuth } from "@/lib/http/route";

export const POST = withAuth("catalogue.manage", async ({ req, db, user }) => {
  return checkImport(db, user, await readImportUpload(req));
});
