// POST /api/set-types/import — import a checked catalogue CSV (multipart: file, organisationId, expectedSha256), all or nothing
import { commitImport, readImportUpload } from "@/lib/catalogue/import-service";
import { withAuth } from "@/lib/http/route";

export const POST = withAuth("catalogue.manage", async ({ req, db, user }) => {
  return commitImport(db, user, await readImportUpload(req));
});
