import { TriangleAlert } from "lucide-react";
import Link from "next/link";
import type { RecallListRow } from "@/lib/sterilising/recalls";

/** The clinic's banner for open recalls that affect its sets. */
export function RecallBanner({ recalls }: { recalls: RecallListRow[] }) {
  const open = recalls.filter((r) => r.status === "open" && r.outstanding > 0);
  if (open.length === 0) return null;
  return (
    <div role="alert" className="mb-6 rounded-card border-2 border-danger-600 bg-danger-50 p-4 text-danger-700" data-testid="recall-banner">
      <p className="flex items-center gap-2 text-lg font-semibold">
        <TriangleAlert className="h-5 w-5" aria-hidden="true" /> {open.length === 1 ? "A recall affects your sets" : `${open.length} recalls affect your sets`}
      </p>
      <ul className="mt-2 space-y-1 text-sm">
        {open.map((r) => (
          <li key={r.id}>
            <Link href={`/clinic/recalls/${r.id}`} className="font-medium underline">
              Recall {r.number}
            </Link>
            : {r.outstanding} set{r.outstanding === 1 ? "" : "s"} not back yet. Do not use them; send them back to the unit.
          </li>
        ))}
      </ul>
    </div>
  );
}
