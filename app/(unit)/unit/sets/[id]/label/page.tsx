import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { loadSetOr404 } from "@/components/sets/set-page";
import { SetLabelSheet } from "@/components/sets/set-label";
import { PageHeader } from "@/components/ui/page-header";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { AppError } from "@/lib/errors";
import { getSetLabel, labelPrintQuerySchema, setSymbolSvg } from "@/lib/sets/label";

export const metadata: Metadata = { title: "Set label" };

// The label of a set for its current (or latest) cycle, or for the cycle named by ?cycle=<id>.
export default async function SetLabelPage({
  params,
  searchParams,
}: {
  params: Promise<{ id: string }>;
  searchParams: Promise<Record<string, string | string[] | undefined>>;
}) {
  const user = await requirePermission("labels.print");
  const { id } = await params;
  const set = await loadSetOr404(user, id);
  const raw = await searchParams;
  const query = labelPrintQuerySchema.safeParse({ cycle: typeof raw.cycle === "string" ? raw.cycle : undefined });
  if (!query.success) notFound();
  let label: Awaited<ReturnType<typeof getSetLabel>>;
  try {
    label = await getSetLabel(getDb(), user, set.id, { cycleId: query.data.cycle });
  } catch (error) {
    if (error instanceof AppError && error.code === "not_found") notFound();
    throw error;
  }
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
        contents={label.contents.map((line) => ({ name: line.name, quantity: line.quantity }))}
        retired={set.status === "retired"}
        cycle={label.cycle}
        notice={label.notice}
      />
    </>
  );
}
