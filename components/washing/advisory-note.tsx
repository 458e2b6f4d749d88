import { ShieldAlert } from "lucide-react";
import { ADVISORY_TEXT } from "@/lib/washing/status";

/** The note beside every computed check: advisory, and the unit's procedures decide. */
export function AdvisoryNote({ className }: { className?: string }) {
  return (
    <p className={`flex gap-2 rounded-lg border border-warn-600/30 bg-warn-50 px-3 py-2 text-sm text-warn-700 ${className ?? ""}`} data-testid="advisory-note">
      <ShieldAlert className="mt-0.5 h-4 w-4 shrink-0" aria-hidden="true" />
      <span>{ADVISORY_TEXT}</span>
    </p>
  );
}
