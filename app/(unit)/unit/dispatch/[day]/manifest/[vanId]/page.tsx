import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { PrintButton } from "@/components/dispatch/print-button";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { ADVISORY_MANIFEST } from "@/lib/dispatch/wording";
import { daySchema } from "@/lib/dispatch/schemas";
import { getManifest } from "@/lib/dispatch/view";
import { AppError } from "@/lib/errors";

export const metadata: Metadata = { title: "Van manifest" };

const KIND_WORDS = { collection: "Collect", delivery: "Deliver", both: "Collect and deliver" } as const;

// One van's manifest for the day, laid out for printing.
export default async function ManifestPage({ params }: { params: Promise<{ day: string; vanId: string }> }) {
  await requirePermission("routes.view");
  const p = await params;
  const day = daySchema.safeParse(p.day);
  if (!day.success || !/^[1-9]\d{0,9}$/.test(p.vanId)) notFound();
  let manifest: Awaited<ReturnType<typeof getManifest>>;
  try {
    manifest = await getManifest(getDb(), day.data, Number(p.vanId));
  } catch (error) {
    if (error instanceof AppError && error.code === "not_found") notFound();
    throw error;
  }
  const { run } = manifest;
  return (
    <article className="mx-auto max-w-3xl space-y-4 bg-white p-6 text-ink print:max-w-none print:p-0">
      <div className="no-print flex items-center justify-between text-sm">
        <Link href={`/unit/dispatch/${day.data}`} className="text-lagoon-700 hover:underline">
          ← Back to the day
        </Link>
        <div className="flex gap-3">
          <a href={`/api/dispatch/${day.data}/manifest/${run.vanId}`} className="text-lagoon-700 hover:underline">
            Download PDF
          </a>
          <PrintButton />
        </div>
      </div>
      <header className="border-b-2 border-ink pb-2">
        <h1 className="text-xl font-semibold">
          Van manifest — {run.vanCode} {run.vanName}
          {manifest.status === "draft" && <span className="ml-2 text-sm font-normal">(draft, not yet published)</span>}
        </h1>
        <p className="text-sm">
          {manifest.dayLabel} · {run.registration} · driver {run.driverName} · shift {run.shift}
        </p>
        <p className="text-sm">
          Leaves {run.leave ?? "—"}, back {run.back ?? "—"} · {run.stops.length} stops · {run.distanceKm.toFixed(1)} km · {run.driveMin} min driving · carts: soiled {run.soiledCarts} of{" "}
          {run.soiledCapacity}, clean {run.cleanCarts} of {run.cleanCapacity}
        </p>
        <p className="mt-1 text-xs text-ink-soft">{ADVISORY_MANIFEST}</p>
      </header>
      <ol className="space-y-4">
        {run.stops.map((s) => (
          <li key={s.id} className="break-inside-avoid border-b border-line pb-3">
            <h2 className="font-semibold">
              {s.position}. {s.siteName} — {KIND_WORDS[s.kind]}
            </h2>
            <p className="text-sm">
              {s.address} ({s.organisationName})
            </p>
            <p className="text-sm">
              Window {s.window}
              {s.hard ? "" : " (soft)"} · planned {s.start ?? "—"}
              {s.lateMin > 0 ? `, ${s.lateMin} min late` : ""} · {s.serviceMin} min on site · carts: soiled {s.soiledCarts}, clean {s.cleanCarts}
            </p>
            {(["collect", "deliver"] as const).map((role) => {
              const refs = s.orders.filter((o) => o.role === role).map((o) => o.reference);
              if (refs.length === 0) return null;
              const sets = role === "collect" ? s.collect : s.deliver;
              return (
                <div key={role} className="mt-1">
                  <p className="text-sm font-medium">
                    {role === "collect" ? "Collect" : "Deliver"} ({refs.join(", ")}): {sets.length} set{sets.length === 1 ? "" : "s"}
                  </p>
                  <table className="mt-1 w-full text-sm">
                    <thead className="text-left text-xs text-ink-soft">
                      <tr>
                        <th className="w-8 font-medium">✓</th>
                        <th className="font-medium">Serial</th>
                        <th className="font-medium">Set</th>
                        <th className="font-medium">GIAI</th>
                      </tr>
                    </thead>
                    <tbody>
                      {sets.map((set) => (
                        <tr key={set.serial} className="border-t border-line">
                          <td aria-hidden="true">☐</td>
                          <td className="font-mono text-xs">{set.serial}</td>
                          <td>{set.name}</td>
                          <td className="font-mono text-xs">{set.giai}</td>
                        </tr>
                      ))}
                    </tbody>
                  </table>
                </div>
              );
            })}
            {s.note && <p className="mt-1 text-xs text-ink-soft">{s.note}</p>}
          </li>
        ))}
      </ol>
    </article>
  );
}
