import { Printer } from "lucide-react";
import Link from "next/link";
import { notFound } from "next/navigation";
import { Button } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { can } from "@/lib/auth/permissions";
import { isCustomerRole } from "@/lib/auth/roles";
import type { SessionUser } from "@/lib/auth/session-user";
import { AppError } from "@/lib/errors";
import { getSet, getSetContents, listSetAuditEntries, type SetView } from "@/lib/sets/service";
import { SetContents, SetDetails, SetHistory } from "./set-details";
import { SetStatusDialog } from "./set-status-dialog";

/** A set in the caller's scope, or the not-found page (another tenant's set, a bad id). */
export async function loadSetOr404(user: SessionUser, rawId: string): Promise<SetView> {
  if (!/^[1-9][0-9]{0,15}$/.test(rawId)) notFound();
  try {
    return await getSet(getDb(), user, Number(rawId));
  } catch (error) {
    if (error instanceof AppError && error.code === "not_found") notFound();
    throw error;
  }
}

/** One set's page: its card, contents and, for those who may see the audit log, its recorded changes. */
export async function SetPage({ user, rawId, basePath }: { user: SessionUser; rawId: string; basePath: string }) {
  const set = await loadSetOr404(user, rawId);
  const db = getDb();
  const contents = await getSetContents(db, user, set.id);
  const history = can(user.role, "audit.view") ? await listSetAuditEntries(db, user, set.id) : null;
  const actions = (
    <>
      {can(user.role, "labels.print") && (
        <Button variant="secondary" asChild>
          <Link href={`${basePath}/${set.id}/label`}>
            <Printer className="h-4 w-4" aria-hidden="true" />
            Label
          </Link>
        </Button>
      )}
      {can(user.role, "sets.manage") && <SetStatusDialog key={set.status} setId={set.id} serial={set.serial} status={set.status} />}
    </>
  );
  return (
    <>
      <p className="mb-2 text-sm">
        <Link href={basePath} className="text-lagoon-700 underline-offset-2 hover:underline">
          ← All sets
        </Link>
      </p>
      <PageHeader title={set.serial} description={`${set.setTypeName} · ${set.homeSiteName}`} actions={actions} />
      <div className="grid gap-6 lg:grid-cols-[3fr_2fr]">
        <div className="space-y-6">
          <SetDetails set={set} showCustomer={!isCustomerRole(user.role)} />
          {history && <SetHistory entries={history} />}
        </div>
        <SetContents contents={contents} />
      </div>
    </>
  );
}
