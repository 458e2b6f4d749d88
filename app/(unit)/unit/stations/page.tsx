import { ArrowRight, Flame, Hand, Layers, type LucideIcon, Package, PackageCheck, Truck } from "lucide-react";
import type { Metadata } from "next";
import Link from "next/link";
import { PageHeader } from "@/components/ui/page-header";
import { requirePermission } from "@/lib/auth/current-user";

export const metadata: Metadata = { title: "Stations" };

const STATIONS: { href: string; name: string; does: string; icon: LucideIcon }[] = [
  {
    href: "/unit/stations/receiving",
    name: "Receiving",
    does: "Scan the sets off the van: tick off each order, flag sets that came unbooked or did not come, see where each goes next.",
    icon: PackageCheck,
  },
  {
    href: "/unit/stations/washing",
    name: "Washing",
    does: "Load a washer-disinfector batch, start it, and record its time and temperature record.",
    icon: Layers,
  },
  {
    href: "/unit/stations/manual-washing",
    name: "Manual washing",
    does: "Sets that must not go in a washer-disinfector: record the wash by hand as a step of its own.",
    icon: Hand,
  },
  {
    href: "/unit/stations/packing",
    name: "Packing",
    does: "Inspect and count the contents against the list, pack, and print the label.",
    icon: Package,
  },
  {
    href: "/unit/stations/sterilising",
    name: "Sterilising",
    does: "Scan packed sets into a steriliser load, start it after the day's air-removal test, and finish it with its record and indicators.",
    icon: Flame,
  },
  {
    href: "/unit/stations/dispatch",
    name: "Dispatch",
    does: "Scan released sets onto the van of today's run that delivers them, and see what each van still has to load.",
    icon: Truck,
  },
];

// The station chooser: one large tile per station of the unit.
export default async function StationsPage() {
  await requirePermission("stations.operate");
  return (
    <>
      <PageHeader title="Stations" description="Choose the station you are working at. Each one keeps the scan field ready for the next set." />
      <ul className="grid gap-4 sm:grid-cols-2">
        {STATIONS.map((s) => (
          <li key={s.href}>
            <Link
              href={s.href}
              className="group flex h-full min-h-40 gap-4 rounded-card border border-line bg-surface p-6 shadow-card transition-colors hover:border-lagoon-400 hover:bg-lagoon-50 focus-visible:bg-lagoon-50"
            >
              <s.icon className="h-10 w-10 shrink-0 text-lagoon-700" aria-hidden="true" />
              <span className="flex-1">
                <span className="flex items-center gap-2 text-2xl font-semibold text-ink">
                  {s.name}
                  <ArrowRight className="h-6 w-6 text-lagoon-700 transition-transform group-hover:translate-x-1" aria-hidden="true" />
                </span>
                <span className="mt-2 block text-base text-muted">{s.does}</span>
              </span>
            </Link>
          </li>
        ))}
      </ul>
    </>
  );
}
