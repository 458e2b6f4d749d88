import type { Metadata } from "next";
import { loadSetTypeOr404 } from "@/components/catalogue/load-set-type";
import { SetTypeView } from "@/components/catalogue/set-type-view";
import { requirePermission } from "@/lib/auth/current-user";

export const metadata: Metadata = { title: "Set type" };

export default async function ClinicSetTypePage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePermission("catalogue.view");
  const setType = await loadSetTypeOr404(user, (await params).id);
  return <SetTypeView setType={setType} backHref="/clinic/catalogue" />;
}
