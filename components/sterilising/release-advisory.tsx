import { ShieldAlert } from "lucide-react";
import { RECALL_ADVISORY_TEXT, RELEASE_ADVISORY_TEXT } from "@/lib/sterilising/status";

/** The notice beside every computed load check, release decision and recall: advisory only. */
export function ReleaseAdvisory({ kind = "release", className }: { kind?: "release" | "recall"; className?: string }) {
  return (
    <p className={`flex gap-2 rounded-lg border border-warn-600/30 bg-warn-50 px-3 py-2 text-sm text-warn-700 ${className ?? ""}`} data-testid="advisory-note">
      <ShieldAlert className="mt-0.5 h-4 w-4 shrink-0" aria-hidden="true" />
      <span>{kind === "recall" ? RECALL_ADVISORY_TEXT : RELEASE_ADVISORY_TEXT}</span>
    </p>
  );
}
