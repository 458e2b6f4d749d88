"use server";

import { serverEnv } from "@/lib/env";
import { defineAction } from "@/lib/http/action";
import { inviteUserSchema, resendInvitationSchema, userStatusSchema } from "./schemas";
import { inviteUser, resendInvitation, setUserStatus } from "./service";

// Server actions for managing people. Each checks the caller's permission and tenant scope.

function mailContext() {
  const env = serverEnv();
  return { appUrl: env.APP_URL, timeZone: env.UNIT_TIME_ZONE };
}

export const inviteUserAction = defineAction("users.invite", inviteUserSchema, async ({ db, user }, input) => {
  const { userId } = await inviteUser(db, user, input, mailContext());
  return { userId };
});

export const resendInvitationAction = defineAction("users.invite", resendInvitationSchema, async ({ db, user }, input) => {
  await resendInvitation(db, user, input.userId, mailContext());
  return { userId: input.userId };
});

export const setUserStatusAction = defineAction("users.manage", userStatusSchema, async ({ db, user }, input) => {
  await setUserStatus(db, user, input);
  return { userId: input.userId };
});
