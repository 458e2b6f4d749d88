import type { Metadata } from "next";
import { SterileSettingsForm } from "@/components/sterilising/sterile-settings-form";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { PACKAGING_LABELS } from "@/lib/catalogue/vocabulary";
import { getShelfLifeRules, getSterileSettings } from "@/lib/sterilising/settings";

export const metadata: Metadata = { title: "Shelf life" };
export const dynamic = "force-dynamic";

// The quality lead's sterilising settings: shelf-life rules, the leak-test limit, the heavy-set threshold.
export default async function ShelfLifePage() {
  await requirePermission("sterile_settings.manage");
  const db = getDb();
  const [rules, settings] = await Promise.all([getShelfLifeRules(db), getSterileSettings(db)]);
  const order = ["single_pouch", "double_pouch", "wrap", "rigid_container"];
  rules.sort((a, b) => order.indexOf(a.packaging) - order.indexOf(b.packaging) || a.storage.localeCompare(b.storage));
  return (
    <>
      <PageHeader
        title="Shelf life and sterilising settings"
        description="Each released set gets its use-by date from its packaging and the storage of the site it goes to."
      />
      <Card>
        <CardHeader
          title="Rules"
          description="Defaults are the DIN 58953-8 guide values: single pouch unprotected 48 hours, single pouch in a closed cabinet 6 months, packaging systems (double pouch, container, two-layer wrap) 5 years — never beyond the manufacturer's date. Shelf life is event-related: a damaged, wet or dropped pack is not sterile whatever its date."
        />
        <CardBody>
          <SterileSettingsForm rules={rules} packagingLabels={PACKAGING_LABELS} leakLimitKpaMin={settings.leakLimitKpaMin} heavySetThresholdG={settings.heavySetThresholdG} />
        </CardBody>
      </Card>
    </>
  );
}
