import { Badge, type BadgeTone } from "@/components/ui/badge";
import type { CheckStatus, ReleaseAssessment } from "@/lib/sterilising/checks";

// The release checks of a load side by side with their limits, and what blocks a release.

const STATUS: Record<CheckStatus, { tone: BadgeTone; label: string }> = {
  pass: { tone: "ok", label: "Meets" },
  fail: { tone: "danger", label: "Does not meet" },
  missing: { tone: "danger", label: "Missing" },
  pending: { tone: "warn", label: "Waiting" },
  waived: { tone: "warn", label: "Early release" },
  not_required: { tone: "neutral", label: "Not required" },
};

export function ReleaseChecks({ assessment, testId }: { assessment: ReleaseAssessment; testId?: string }) {
  return (
    <div className="space-y-3" data-testid={testId ?? "release-checks"}>
      <div className="overflow-x-auto">
        <table className="w-full text-left text-sm">
          <thead className="text-xs uppercase text-muted">
            <tr>
              <th scope="col" className="py-2 pr-3 font-medium">
                Check
              </th>
              <th scope="col" className="py-2 pr-3 font-medium">
                Found
              </th>
              <th scope="col" className="py-2 pr-3 font-medium">
                Limit
              </th>
              <th scope="col" className="py-2 font-medium">
                Result
              </th>
            </tr>
          </thead>
          <tbody className="divide-y divide-line">
            {assessment.checks.map((c) => (
              <tr key={c.key} data-check={c.key} data-status={c.status}>
                <th scope="row" className="py-2 pr-3 font-medium text-ink">
                  {c.label}
                </th>
                <td className="py-2 pr-3 text-ink">{c.measured}</td>
                <td className="py-2 pr-3 text-muted">{c.limit}</td>
                <td className="py-2">
                  <Badge tone={STATUS[c.status].tone}>{STATUS[c.status].label}</Badge>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {assessment.blockers.length > 0 && (
        <div role="status" className="rounded-lg border-2 border-danger-600 bg-danger-50 p-3 text-danger-700" data-testid="release-blockers">
          <p className="font-semibold">Release is not possible yet:</p>
          <ul className="list-disc pl-5">
            {assessment.blockers.map((b) => (
              <li key={b}>{b}</li>
            ))}
          </ul>
        </div>
      )}
    </div>
  );
}
