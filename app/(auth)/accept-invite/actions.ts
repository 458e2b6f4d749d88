"use server";

import { getDb } from "@/db";
import { type ActionResult, failure } from "@/lib/http/action";
import { zodFieldErrors } from "@/lib/errors";
import { acceptInvitation } from "@/lib/users/service";
import { type AcceptInvitationInput, acceptInvitationSchema } from "@/lib/users/schemas";

// Sets the password of an invited user. Public: the one-time token is the credential.
export async function acceptInvitationAction(input: AcceptInvitationInput): Promise<ActionResult<{ email: string }>> {
  const parsed = acceptInvitationSchema.safeParse(input);
  if (!parsed.success) {
    return { ok: false, error: { code: "validation", message: "Some fields need attention.", fields: zodFieldErrors(parsed.error) } };
  }
  try {
    return { ok: true, data: await acceptInvitation(getDb(), parsed.data) };
  } catch (error) {
    return failure(error);
  }
}
