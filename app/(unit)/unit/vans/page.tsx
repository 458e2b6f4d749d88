import { Plus } from "lucide-react";
import type { Metadata } from "next";
import { VanDialog } from "@/components/dispatch/van-dialog";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { listVans } from "@/lib/dispatch/vans";

export const metadata: Metadata = { title: "Vans" };

// The unit's vans and the carts each compartment holds.
export default async function VansPage() {
  await requirePermission("vans.manage");
  const vans = await listVans(getDb());
  return (
    <>
      <PageHeader
        title="Vans"
        description="Each van carries closed carts in two segregated compartments: soiled sets on the way in, clean sets on the way out. The planner never fills either beyond what is set here."
        actions={
          <VanDialog
            trigger={
              <Button>
                <Plus className="h-4 w-4" aria-hidden="true" /> Add a van
              </Button>
            }
          />
        }
      />
      <Card>
        <table className="w-full text-sm">
          <thead className="border-b border-line text-left text-xs text-muted">
            <tr>
              <th className="px-5 py-2 font-medium">Code</th>
              <th className="px-5 py-2 font-medium">Name</th>
              <th className="px-5 py-2 font-medium">Registration</th>
              <th className="px-5 py-2 font-medium">Soiled carts</th>
              <th className="px-5 py-2 font-medium">Clean carts</th>
              <th className="px-5 py-2 font-medium">Status</th>
              <th className="px-5 py-2 font-medium">
                <span className="sr-only">Actions</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {vans.map((v) => (
              <tr key={v.id} className="border-t border-line">
                <td className="px-5 py-2 font-medium">{v.code}</td>
                <td className="px-5 py-2">{v.name}</td>
                <td className="px-5 py-2">{v.registration}</td>
                <td className="px-5 py-2 tabular-nums">{v.soiledCapacityCarts}</td>
                <td className="px-5 py-2 tabular-nums">{v.cleanCapacityCarts}</td>
                <td className="px-5 py-2">{v.active ? <Badge tone="ok">In service</Badge> : <Badge>Out of service</Badge>}</td>
                <td className="px-5 py-2 text-right">
                  <VanDialog
                    van={v}
                    trigger={
                      <Button size="sm" variant="ghost">
                        Change
                      </Button>
                    }
                  />
                </td>
              </tr>
            ))}
            {vans.length === 0 && (
              <tr>
                <td colSpan={7} className="px-5 py-6 text-center text-muted">
                  No vans yet.
                </td>
              </tr>
            )}
          </tbody>
        </table>
      </Card>
    </>
  );
}
