import type { ReactNode } from "react";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import type { RunNoun, StationRunItem } from "./run-kind";

/** The sets in a run, each with its state; while the run is being loaded each can be taken out. */
export function RunItems<I extends StationRunItem>({
  noun,
  items,
  loading,
  busy,
  emptyText,
  detailSuffix,
  badges,
  onRemove,
}: {
  noun: RunNoun;
  items: I[];
  /** The run is still being loaded: its sets can be taken out. */
  loading: boolean;
  busy: boolean;
  emptyText: string;
  /** Follows the set's customer and size, e.g. " · lower shelf". */
  detailSuffix?: (item: I) => string;
  /** The set's badges (its state, at least). */
  badges: (item: I) => ReactNode;
  onRemove: (cycleId: number, serial: string) => void;
}) {
  return (
    <Card>
      <CardHeader title={`Sets in the ${noun}`} />
      {items.length === 0 ? (
        <CardBody className="text-base text-muted">{emptyText}</CardBody>
      ) : (
        <ul className="divide-y divide-line" data-testid={`${noun}-items`}>
          {items.map((i) => (
            <li key={i.cycleId} className="flex flex-wrap items-center justify-between gap-3 px-5 py-3">
              <div>
                <p className="text-lg font-semibold text-ink">
                  {i.serial} <span className="font-normal text-ink-soft">· {i.setTypeName}</span>
                </p>
                <p className="text-sm text-muted">
                  {i.organisationName} · {i.sizeStu} StU{detailSuffix?.(i)}
                </p>
              </div>
              <div className="flex items-center gap-3">
                {badges(i)}
                {loading && (
                  <Button variant="secondary" size="lg" disabled={busy} onClick={() => onRemove(i.cycleId, i.serial)} aria-label={`Take ${i.serial} out of the ${noun}`}>
                    Take out
                  </Button>
                )}
              </div>
            </li>
          ))}
        </ul>
      )}
    </Card>
  );
}
