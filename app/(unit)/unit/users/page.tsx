import type { Metadata } from "next";
import { PeoplePage } from "@/components/users/people-page";
import { requirePermission } from "@/lib/auth/current-user";

export const metadata: Metadata = { title: "People" };

export default async function UnitPeoplePage() {
  const user = await requirePermission("users.view");
  return (
    <PeoplePage
      user={user}
      title="People"
      description="The unit's staff and every customer's users. Switching an account off ends its sessions at once."
    />
  );
}
