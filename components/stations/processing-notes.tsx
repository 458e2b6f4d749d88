"use client";

import { FileText, Info } from "lucide-react";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { Dialog, DialogContent, DialogTrigger } from "@/components/ui/dialog";
import { PROCESSING_FLAG_LABELS, type ProcessingFlag } from "@/lib/catalogue/vocabulary";

/** The set type's processing notes and IFU, one tap away at every station. */
export function ProcessingNotes({
  typeName,
  flags,
  notes,
  ifuFileId,
}: {
  typeName: string;
  flags: ProcessingFlag[];
  notes: string | null;
  ifuFileId: number | null;
}) {
  return (
    <div className="flex flex-wrap items-center gap-2">
      {flags.map((f) => (
        <Badge key={f} tone={f === "manual_wash_only" ? "warn" : "info"}>
          {PROCESSING_FLAG_LABELS[f]}
        </Badge>
      ))}
      <Dialog>
        <DialogTrigger asChild>
          <Button variant="secondary" size="lg">
            <Info className="h-5 w-5" aria-hidden="true" /> Processing notes
          </Button>
        </DialogTrigger>
        <DialogContent title={`Processing: ${typeName}`}>
          <div className="space-y-3 text-sm">
            {flags.length === 0 && !notes && <p className="text-muted">No special processing recorded for this set type.</p>}
            {flags.length > 0 && (
              <ul className="list-disc pl-5">
                {flags.map((f) => (
                  <li key={f}>{PROCESSING_FLAG_LABELS[f]}</li>
                ))}
              </ul>
            )}
            {notes && <p className="whitespace-pre-wrap">{notes}</p>}
            <p className="text-xs text-muted">Follow the manufacturer&apos;s instructions for use and the unit&apos;s validated procedures.</p>
          </div>
        </DialogContent>
      </Dialog>
      {ifuFileId && (
        <Button variant="secondary" size="lg" asChild>
          <a href={`/api/files/${ifuFileId}`} target="_blank" rel="noreferrer">
            <FileText className="h-5 w-5" aria-hidden="true" /> Instructions for use
          </a>
        </Button>
      )}
    </div>
  );
}
