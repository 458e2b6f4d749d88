import type { Metadata } from "next";
import Link from "next/link";
import { loadSetOr404 } from "@/components/sets/set-page";
import { SetLabelSheet } from "@/components/sets/set-label";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { setSymbolSvg } from "@/lib/sets/label";
import { getSetContents } from "@/lib/sets/service";

export const metadata: Metadata = { title: "Set label" };

export default async function SetLabelPage({ params }: { params: Promise<{ id: string }> }) {
  const user = await requirePermission("labels.print");
  const { id } = await params;
  const set = await loadSetOr404(user, id);
  const contents = await getSetContents(getDb(), user, set.id);
  return (
    <>
      <div className="no-print">
        <p className="mb-2 text-sm">
          <Link href={`/unit/sets/${set.id}`} className="text-lagoon-700 underline-offset-2 hover:underline">
            ← {set.serial}
          </Link>
        </p>
        <PageHeader title={`Label for ${set.serial}`} description={`${set.setTypeName} · ${set.organisationName}`} />
      </div>
      <SetLabelSheet
        label={{
          id: set.id,
          serial: set.serial,
          humanReadable: set.humanReadable,
          setTypeName: set.setTypeName,
          setTypeCode: set.setTypeCode,
          organisationName: set.organisationName,
          homeSiteName: set.homeSiteName,
        }}
        symbolSvg={setSymbolSvg(set.giai)}
        contents={contents.map((line) => ({ name: line.name, quantity: line.quantity }))}
        retired={set.status === "retired"}
      />
    </>
  );
}
