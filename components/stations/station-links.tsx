import Link from "next/link";

/** The links beside a station's title: its own lists, then the way back to the other stations. */
export function StationLinks({ links }: { links: { href: string; label: string }[] }) {
  return (
    <div className="flex gap-4">
      {[...links, { href: "/unit/stations", label: "Other stations" }].map((l) => (
        <Link key={l.href} href={l.href} className="text-sm font-medium text-lagoon-700 underline">
          {l.label}
        </Link>
      ))}
    </div>
  );
}
