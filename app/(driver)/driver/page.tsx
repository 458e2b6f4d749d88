import type { Metadata } from "next";
import { Truck } from "lucide-react";
import { Card, CardBody } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { formatDate } from "@/lib/format";
import { depot } from "@/lib/home/queries";

export const metadata: Metadata = { title: "Today" };

// The driver's home, made for a phone: today's run sheet once the dispatcher publishes one.
export default async function DriverHome() {
  const user = await requirePermission("home.view");
  const base = await depot(getDb());
  return (
    <>
      <PageHeader title="Today" description={formatDate(new Date())} />
      <Card>
        <CardBody className="flex items-start gap-4">
          <Truck className="mt-1 h-8 w-8 shrink-0 text-lagoon-700" aria-hidden="true" />
          <div className="space-y-1 text-sm">
            <p className="text-base font-semibold">No run sheet for you today yet</p>
            <p className="text-muted">
              When the dispatcher publishes today&apos;s plan, your stops appear here in order, {user.name.split(" ")[0]}.
            </p>
            {base && (
              <p className="pt-2">
                Start and finish at <span className="font-medium">{base.name}</span>, {base.address}.
              </p>
            )}
          </div>
        </CardBody>
      </Card>
    </>
  );
}
