import { CircleAlert, CircleCheck, OctagonX } from "lucide-react";
import type { WasherBatchStatus } from "@/db/schema";
import { cn } from "@/lib/cn";
import { comparisonRows, type StoredFigures } from "@/lib/washing/figures";
import { AdvisoryNote } from "./advisory-note";

/**
 * A closed batch's decision and its computed figures side by side with the program's
 * requirement, with the reasons for a failure and any remarks. Advisory, and says so.
 */
export function BatchResult({
  status,
  figures,
  reasons,
  requirementText,
  size = "md",
}: {
  status: WasherBatchStatus;
  figures: StoredFigures | null;
  reasons: string[];
  requirementText: string;
  size?: "md" | "lg";
}) {
  const big = size === "lg";
  const passed = status === "passed";
  const Icon = passed ? CircleCheck : status === "aborted" ? OctagonX : CircleAlert;
  const headline =
    status === "passed"
      ? "The record meets the program's requirement"
      : status === "failed"
        ? "The record does not meet the program's requirement: the sets go back to washing"
        : "Aborted after a fault: the sets go back to washing";
  return (
    <div className="space-y-4" data-testid="batch-result">
      <div
        role={passed ? "status" : "alert"}
        className={cn(
          "flex items-start gap-3 rounded-card border-2 p-4",
          passed ? "border-ok-600 bg-ok-50 text-ok-700" : "border-danger-600 bg-danger-50 text-danger-700",
        )}
      >
        <Icon className={cn("shrink-0", big ? "h-8 w-8" : "h-6 w-6")} aria-hidden="true" />
        <div>
          <p className={cn("font-semibold", big ? "text-2xl" : "text-lg")}>
            {passed ? "✓" : "✕"} {headline}
          </p>
          {reasons.length > 0 && (
            <ul className={cn("mt-2 list-disc space-y-1 pl-5", big ? "text-lg" : "text-sm")} data-testid="batch-reasons">
              {reasons.map((r) => (
                <li key={r}>{r}</li>
              ))}
            </ul>
          )}
        </div>
      </div>
      {figures && (
        <div className="overflow-x-auto rounded-card border border-line">
          <table className={cn("w-full text-left", big ? "text-base" : "text-sm")}>
            <caption className="sr-only">Computed figures beside the requirement ({requirementText})</caption>
            <thead className="border-b border-line bg-paper/60 text-xs uppercase tracking-wide text-muted">
              <tr>
                <th scope="col" className="px-4 py-2 font-semibold">
                  Measure
                </th>
                <th scope="col" className="px-4 py-2 font-semibold">
                  From the record
                </th>
                <th scope="col" className="px-4 py-2 font-semibold">
                  Required
                </th>
                <th scope="col" className="px-4 py-2 font-semibold">
                  <span className="sr-only">Meets it</span>
                </th>
              </tr>
            </thead>
            <tbody className="divide-y divide-line">
              {comparisonRows(figures).map((row) => (
                <tr key={row.label}>
                  <th scope="row" className="px-4 py-2 font-medium text-ink">
                    {row.label}
                  </th>
                  <td className="px-4 py-2 tabular-nums">{row.computed}</td>
                  <td className="px-4 py-2 text-muted">{row.required}</td>
                  <td className="px-4 py-2">
                    {row.ok === true && <span className="font-semibold text-ok-700">✓ meets it</span>}
                    {row.ok === false && <span className="font-semibold text-danger-700">✕ short</span>}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      {figures && figures.notes.length > 0 && (
        <ul className="list-disc space-y-1 pl-5 text-sm text-muted">
          {figures.notes.map((n) => (
            <li key={n}>{n}</li>
          ))}
        </ul>
      )}
      <AdvisoryNote />
    </div>
  );
}
