import type { Metadata } from "next";
import { Pencil, Plus } from "lucide-react";
import Link from "next/link";
import { notFound } from "next/navigation";
import { OrganisationDialog } from "@/components/customers/organisation-dialog";
import { OrganisationStatusButton } from "@/components/customers/organisation-status-button";
import { SiteDialog } from "@/components/sites/site-dialog";
import { SitesTable } from "@/components/sites/sites-table";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { AppError } from "@/lib/errors";
import { weekdayKey } from "@/lib/format";
import { getOrganisation } from "@/lib/organisations/service";

export const metadata: Metadata = { title: "Customer" };

// One organisation: its details, its sites, and the way to its catalogue, sets, contracts and people.
export default async function CustomerPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePermission("organisations.view");
  const { id } = await params;
  if (!/^\d+$/.test(id)) notFound();
  const org = await getOrganisation(getDb(), user, Number(id)).catch((error: unknown) => {
    if (error instanceof AppError && error.code === "not_found") notFound();
    throw error;
  });
  const manage = can(user.role, "organisations.manage");
  return (
    <>
      <PageHeader
        title={org.name}
        description={org.kind === "unit" ? "The unit itself: its depot is where every van run starts and ends." : `Customer ${org.shortCode}`}
        actions={
          manage && (
            <>
              <OrganisationDialog
                organisation={org}
                trigger={
                  <Button variant="secondary">
                    <Pencil className="h-4 w-4" aria-hidden="true" /> Edit
                  </Button>
                }
              />
              {org.kind === "customer" && <OrganisationStatusButton id={org.id} active={org.active} name={org.name} />}
            </>
          )
        }
      />
      <div className="mb-6 grid gap-4 md:grid-cols-3">
        <Card>
          <CardBody>
            <p className="text-sm text-muted">Status</p>
            <p className="mt-1">{org.active ? <Badge tone="ok">Active</Badge> : <Badge>Switched off</Badge>}</p>
          </CardBody>
        </Card>
        <Card>
          <CardBody>
            <p className="text-sm text-muted">Billing e-mail</p>
            <p className="mt-1 font-medium">{org.billingEmail ?? "—"}</p>
          </CardBody>
        </Card>
        <Card>
          <CardBody>
            <p className="text-sm text-muted">People with an account</p>
            <p className="mt-1 font-medium">
              {org.users}{" "}
              {can(user.role, "users.view") && (
                <Link href="/unit/users" className="text-sm font-normal text-lagoon-700 underline">
                  manage
                </Link>
              )}
            </p>
          </CardBody>
        </Card>
      </div>
      {org.kind === "customer" && (
        <nav aria-label="Customer records" className="mb-6 flex flex-wrap gap-2 text-sm">
          <Link className="rounded-lg border border-line bg-surface px-3 py-2 hover:bg-lagoon-50" href={`/unit/catalogue?organisationId=${org.id}`}>
            Set catalogue
          </Link>
          <Link className="rounded-lg border border-line bg-surface px-3 py-2 hover:bg-lagoon-50" href={`/unit/sets?organisationId=${org.id}`}>
            Sets
          </Link>
          <Link className="rounded-lg border border-line bg-surface px-3 py-2 hover:bg-lagoon-50" href={`/unit/contracts?organisationId=${org.id}`}>
            Contracts
          </Link>
        </nav>
      )}
      <Card>
        <CardHeader
          title={`Sites (${org.sites})`}
          description="Addresses, opening hours and delivery notes the vans work from."
          action={
            can(user.role, "sites.manage") && (
              <SiteDialog
                organisationId={org.id}
                trigger={
                  <Button size="sm">
                    <Plus className="h-4 w-4" aria-hidden="true" /> Add site
                  </Button>
                }
              />
            )
          }
        />
        <CardBody>
          <SitesTable organisations={[]} organisationId={org.id} today={weekdayKey(new Date())} canManage={can(user.role, "sites.manage")} />
        </CardBody>
      </Card>
    </>
  );
}
