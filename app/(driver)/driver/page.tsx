import type { Metadata } from "next";
import { Truck } from "lucide-react";
import { OutboxStatus } from "@/components/driver/outbox-status";
import { RunSheetView } from "@/components/driver/run-sheet-view";
import { Card, CardBody } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { formatDate } from "@/lib/format";
import { depot } from "@/lib/home/queries";
import { getRunSheet, todaysRunsFor } from "@/lib/runs/service";

export const metadata: Metadata = { title: "Today" };

// The driver's home, made for a phone: today's run sheet, once the dispatcher has published the plan.
export default async function DriverHome() {
  const user = await requirePermission("runs.work");
  const db = getDb();
  const runs = await todaysRunsFor(db, user);
  const sheets = await Promise.all(runs.map((r) => getRunSheet(db, user, r.runId)));
  const base = await depot(db);
  return (
    <div className="mx-auto max-w-xl space-y-4">
      <PageHeader title="Today" description={formatDate(new Date())} />
      <OutboxStatus />
      {sheets.length === 0 ? (
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
      ) : (
        <>
          {base && (
            <p className="text-sm text-ink-soft">
              Start and finish at <span className="font-medium">{base.name}</span>, {base.address}.
            </p>
          )}
          {sheets.map((sheet) => (
            <RunSheetView key={sheet.runId} sheet={sheet} />
          ))}
        </>
      )}
    </div>
  );
}
