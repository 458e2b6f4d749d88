import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { can } from "@/lib/auth/permissions";
import { CUSTOMER_ROLES, isCustomerRole, ROLES } from "@/lib/auth/roles";
import type { SessionUser } from "@/lib/auth/session-user";
import { inviteOptions } from "@/lib/users/assignable";
import { InviteDialog } from "./invite-dialog";
import { PeopleTable } from "./people-table";

/** The people page of either audience: the table and, where allowed, the invite dialog. */
export async function PeoplePage({ user, title, description }: { user: SessionUser; title: string; description: string }) {
  const options = can(user.role, "users.invite") ? await inviteOptions(getDb(), user) : [];
  const customer = isCustomerRole(user.role);
  return (
    <>
      <PageHeader title={title} description={description} actions={options.length > 0 && <InviteDialog options={options} />} />
      <PeopleTable roles={customer ? CUSTOMER_ROLES : ROLES} showOrganisation={!customer} currentUserId={user.id} />
    </>
  );
}
