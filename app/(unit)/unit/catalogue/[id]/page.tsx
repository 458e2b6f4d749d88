import type { Metadata } from "next";
import { loadSetTypeOr404 } from "@/components/catalogue/load-set-type";
import { SetTypeFormDialog } from "@/components/catalogue/set-type-form-dialog";
import { SetTypeStatusButton } from "@/components/catalogue/set-type-status-button";
import { formDefaultsOf, SetTypeView } from "@/components/catalogue/set-type-view";
import { requirePermission } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";

export const metadata: Metadata = { title: "Set type" };

export default async function UnitSetTypePage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePermission("catalogue.view");
  const setType = await loadSetTypeOr404(user, (await params).id);
  const canManage = can(user.role, "catalogue.manage");
  return (
    <SetTypeView
      setType={setType}
      backHref={`/unit/catalogue?organisation=${setType.organisationId}`}
      actions={
        canManage && (
          <>
            <SetTypeStatusButton setTypeId={setType.id} active={setType.active} name={setType.name} />
            <SetTypeFormDialog
              key={setType.updatedAt}
              target={{ mode: "edit", organisationId: setType.organisationId, setTypeId: setType.id }}
              organisationName={setType.organisationName}
              defaults={formDefaultsOf(setType)}
              basePath="/unit/catalogue"
            />
          </>
        )
      }
    />
  );
}
