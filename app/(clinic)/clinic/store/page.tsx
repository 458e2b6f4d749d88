import type { Metadata } from "next";
import { StoreRequestForm } from "@/components/orders/store-request-form";
import { Card, CardBody } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { serverEnv } from "@/lib/env";
import { newBookingDefaults } from "@/lib/orders/defaults";
import { storedSets } from "@/lib/orders/store-requests";

export const metadata: Metadata = { title: "In the unit's store" };

export default async function ClinicStorePage() {
  const user = await requirePermission("orders.view");
  const timeZone = serverEnv().UNIT_TIME_ZONE;
  const sets = await storedSets(getDb(), user);
  return (
    <>
      <PageHeader
        title="In the unit's store"
        description="Sets you asked the unit to keep after processing. Ask for them and they come on the next delivery to your site."
      />
      <Card>
        <CardBody>
          <StoreRequestForm sets={sets} defaultNeededBy={newBookingDefaults(0, new Date(), timeZone).neededBackBy} timeZone={timeZone} />
        </CardBody>
      </Card>
    </>
  );
}
