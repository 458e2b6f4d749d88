// POST /api/files — upload one file (multipart: file, purpose, organisationId); answers its id
import { z } from "zod";
import { can } from "@/lib/auth/permissions";
import { canReachOrganisation } from "@/lib/auth/scope";
import { isCustomerRole } from "@/lib/auth/roles";
import { AppError, notFound } from "@/lib/errors";
import { withAuth } from "@/lib/http/route";
import { isUploadPurpose, saveUpload } from "@/lib/storage/files";

const fieldsSchema = z.object({
  purpose: z.string().refine(isUploadPurpose, "Unknown upload purpose."),
  organisationId: z.preprocess((v) => (v === "" || v == null ? null : v), z.coerce.number().int().positive().nullable()),
});

export const POST = withAuth("files.upload", async ({ req, db, user }) => {
  const form = await req.formData().catch(() => {
    throw new AppError("invalid", "Send the upload as multipart form data with a file field.");
  });
  const file = form.get("file");
  if (!(file instanceof File)) throw new AppError("validation", "Choose a file to upload.", { file: ["Choose a file."] });
  const fields = fieldsSchema.parse({ purpose: form.get("purpose"), organisationId: form.get("organisationId") });
  if (fields.purpose === "ifu" && !can(user.role, "catalogue.manage")) {
    throw new AppError("forbidden", "Only the unit's administrator files instructions for use.");
  }
  // Customers always upload into their own organisation; unit staff name the customer.
  const organisationId = isCustomerRole(user.role) ? user.organisationId : fields.organisationId;
  if (organisationId !== null && !canReachOrganisation(user, organisationId)) throw notFound("That organisation");
  if (organisationId !== null) {
    const exists = await db.selectFrom("organisations").select("id").where("id", "=", organisationId).executeTakeFirst();
    if (!exists) throw notFound("That organisation");
  }
  const saved = await saveUpload(db, {
    bytes: new Uint8Array(await file.arrayBuffer()),
    originalName: file.name,
    purpose: fields.purpose,
    organisationId,
    uploadedBy: user.id,
  });
  return { id: saved.id, name: saved.original_name, contentType: saved.content_type, sizeBytes: saved.size_bytes, sha256: saved.sha256 };
});
