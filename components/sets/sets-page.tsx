import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { can } from "@/lib/auth/permissions";
import { isCustomerRole } from "@/lib/auth/roles";
import type { SessionUser } from "@/lib/auth/session-user";
import { setCustomerOptions } from "@/lib/sets/service";
import { AddSetsDialog } from "./add-sets-dialog";
import { SetsTable } from "./sets-table";

/** The sets page of either audience: the table and, where allowed, the dialog that adds sets. */
export async function SetsPage({
  user,
  title,
  description,
  basePath,
}: {
  user: SessionUser;
  title: string;
  description: string;
  basePath: string;
}) {
  const customers = await setCustomerOptions(getDb(), user);
  const manage = can(user.role, "sets.manage");
  return (
    <>
      <PageHeader title={title} description={description} actions={manage && <AddSetsDialog customers={customers} />} />
      <SetsTable customers={customers} basePath={basePath} showCustomer={!isCustomerRole(user.role)} />
    </>
  );
}
