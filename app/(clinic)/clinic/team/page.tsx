import type { Metadata } from "next";
import { PeoplePage } from "@/components/users/people-page";
import { requirePermission } from "@/lib/auth/current-user";

export const metadata: Metadata = { title: "Team" };

export default async function ClinicTeamPage() {
  const user = await requirePermission("users.view");
  return (
    <PeoplePage
      user={user}
      title="Team"
      description={`Everyone at ${user.organisationName} who can book pickups and follow sets. Switching an account off ends its sessions at once.`}
    />
  );
}
