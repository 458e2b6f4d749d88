import type { ReactNode } from "react";
import { Card, CardBody } from "@/components/ui/card";
import { ProcessingNotes } from "./processing-notes";
import type { RunNoun, ScannedIntoRun } from "./run-kind";

/** The set just scanned into a run: what it is, whose, its processing notes and what to do next. */
export function ScannedSetCard({ set, noun, hints, nextText }: { set: ScannedIntoRun; noun: RunNoun; hints?: ReactNode; nextText: string }) {
  return (
    <Card data-testid="scanned-set">
      <CardBody className="space-y-3">
        <p className="text-sm font-medium text-ok-700">✓ Added to the {noun}</p>
        <p className="text-2xl font-semibold text-ink">
          {set.serial} · {set.setTypeName}
        </p>
        <p className="text-base text-muted">
          {set.organisationName} · {set.homeSiteName} · {set.sizeStu} StU
        </p>
        {hints}
        <ProcessingNotes typeName={set.setTypeName} flags={set.flags} notes={set.processingNotes} ifuFileId={set.ifuFileId} />
        <p className="text-base text-ink-soft">{nextText}</p>
      </CardBody>
    </Card>
  );
}
