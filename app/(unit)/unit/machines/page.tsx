import { Plus } from "lucide-react";
import type { Metadata } from "next";
import { MachineDialog } from "@/components/machines/machine-dialog";
import { MachinesList } from "@/components/machines/machines-list";
import { Button } from "@/components/ui/button";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { listMachines } from "@/lib/machines/service";

export const metadata: Metadata = { title: "Machines" };

// The unit's machines of every kind, with their programs.
export default async function MachinesPage() {
  const user = await requirePermission("machines.view");
  const machines = await listMachines(getDb());
  return (
    <>
      <PageHeader
        title="Machines"
        description="The unit's washer-disinfectors, sterilisers, heat sealers, drying cabinets and ultrasonic baths, and the programs each one runs."
        actions={
          can(user.role, "machines.manage") && (
            <MachineDialog
              trigger={
                <Button>
                  <Plus className="h-4 w-4" aria-hidden="true" /> Add a machine
                </Button>
              }
            />
          )
        }
      />
      <MachinesList machines={machines} />
    </>
  );
}
