import type { Metadata } from "next";
import { BatchesTable } from "@/components/washing/batches-table";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { listMachines } from "@/lib/machines/service";

export const metadata: Metadata = { title: "Washer batches" };

// Every washer-disinfector batch: machine, program, status and date, paged on the server.
export default async function BatchesPage({ searchParams }: { searchParams: Promise<{ machine?: string }> }) {
  await requirePermission("machines.view");
  const { machine } = await searchParams;
  const washers = (await listMachines(getDb(), { kind: "washer" })).map((w) => ({ id: w.id, code: w.code, name: w.name }));
  const initial = machine && /^[1-9][0-9]{0,9}$/.test(machine) ? Number(machine) : undefined;
  return (
    <>
      <PageHeader
        title="Washer batches"
        description="Every run of the washer-disinfectors with its program, its sets and its record. Open a batch for its figures and temperature curve."
      />
      <BatchesTable washers={washers} initialMachineId={initial} />
    </>
  );
}
