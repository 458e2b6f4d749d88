import { ShieldAlert } from "lucide-react";

export const PLAN_ADVISORY =
  "The plan is a proposal from the route planner, built from straight-line distances times a road factor at an average speed. It is advisory: the dispatcher, the drivers' working-time rules, the unit's transport procedures and local regulations decide.";

/** The note on every planning screen: advisory, and people and procedures decide. */
export function PlanAdvisory() {
  return (
    <p className="flex gap-2 rounded-lg border border-warn-600/30 bg-warn-50 px-3 py-2 text-sm text-warn-700" data-testid="advisory-note">
      <ShieldAlert className="mt-0.5 h-4 w-4 shrink-0" aria-hidden="true" />
      <span>{PLAN_ADVISORY}</span>
    </p>
  );
}
