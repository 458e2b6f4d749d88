import { redirect } from "next/navigation";
import type { ReactNode } from "react";
import { requireUser } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { type Audience, audienceOf, homePathFor, ROLE_LABELS } from "@/lib/auth/roles";
import { AppShell } from "./app-shell";
import { NAVIGATION } from "./navigation";

/** The layout of one audience's route group: signed in, the right audience, its navigation. */
export async function AudienceLayout({ audience, children }: { audience: Audience; children: ReactNode }) {
  const user = await requireUser();
  if (audienceOf(user.role) !== audience) redirect(homePathFor(user.role));
  const items = NAVIGATION[audience].filter((item) => can(user.role, item.action));
  return (
    <AppShell
      items={items}
      user={{ name: user.name, roleLabel: ROLE_LABELS[user.role], organisationName: user.organisationName }}
    >
      {children}
    </AppShell>
  );
}
