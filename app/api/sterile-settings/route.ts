// POST /api/sterile-settings — the quality lead changes the leak limit, the heavy-set threshold and the shelf-life rules
import { withAuth } from "@/lib/http/route";
import { updateSterileSettings } from "@/lib/sterilising/settings";
import { sterileSettingsSchema } from "@/lib/sterilising/schemas";
import { readBody } from "@/lib/washing/body";

export const POST = withAuth("sterile_settings.manage", async ({ req, db, user }) => {
  await updateSterileSettings(db, user, await readBody(req, sterileSettingsSchema));
  return { ok: true };
});
