"use client";

import { Square } from "lucide-react";
import { useState } from "react";
import { Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { Field } from "@/components/ui/field";
import { Textarea } from "@/components/ui/input";
import type { MachineNoun, RunNoun } from "./run-kind";

/** Aborting a running run after a machine fault, with what went wrong; folded away until asked for. */
export function AbortRunForm({ noun, machineNoun, busy, onAbort }: { noun: RunNoun; machineNoun: MachineNoun; busy: boolean; onAbort: (reason: string) => void }) {
  const [open, setOpen] = useState(false);
  const [reason, setReason] = useState("");
  if (!open) {
    return (
      <Button variant="secondary" size="lg" onClick={() => setOpen(true)}>
        <Square className="h-5 w-5" aria-hidden="true" /> The {machineNoun} stopped with a fault…
      </Button>
    );
  }
  return (
    <Card>
      <CardHeader title={`Abort the ${noun}`} description={`Every set in it goes back to washing. Say what happened, e.g. the fault the ${machineNoun} showed.`} />
      <CardBody className="space-y-4">
        <Field id="abort-reason" label="What went wrong">
          <Textarea id="abort-reason" value={reason} onChange={(e) => setReason(e.target.value)} className="text-base" />
        </Field>
        <div className="flex flex-wrap gap-3">
          <Button variant="danger" size="lg" disabled={busy} onClick={() => onAbort(reason)}>
            Abort the {noun}
          </Button>
          <Button variant="secondary" size="lg" onClick={() => setOpen(false)}>
            Cancel
          </Button>
        </div>
      </CardBody>
    </Card>
  );
}
