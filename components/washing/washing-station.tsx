"use client";

import { WashingMachine } from "lucide-react";
import { RunStation } from "@/components/stations/run-station";
import { Badge } from "@/components/ui/badge";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import type { BatchView, ScannedSet, WasherOption } from "@/lib/washing/service";
import { AdvisoryNote } from "./advisory-note";
import { BatchResult } from "./batch-result";
import { BatchStatusBadge } from "./batch-status-badge";
import { RecordForm } from "./record-form";

// The washing station: choose a washer and its program (or continue its open batch), scan the
// sets into the batch, start it, then close it with the washer's record — the result shown beside
// the program's requirement — or abort it after a fault. The flow is the shared batch-style
// station (components/stations/run-station.tsx); what is the washer's own is here.

export function WashingStation({ initialWashers }: { initialWashers: WasherOption[] }) {
  return (
    <RunStation<"batch", "washer", WasherOption, BatchView, ScannedSet>
      noun="batch"
      machineNoun="washer"
      initialMachines={initialWashers}
      machinesUrl="/api/stations/washing"
      runsUrl="/api/stations/washing/batches"
      finishPath="close"
      recordHref={(id) => `/unit/batches/${id}`}
      openRunOf={(w) => w.openBatch}
      statusBadge={(status) => <BatchStatusBadge status={status} />}
      picker={{
        icon: WashingMachine,
        gridClassName: "sm:grid-cols-2 lg:grid-cols-3",
        emptyText: "No washer-disinfector is switched on. Add or switch one on under Machines.",
      }}
      openDescription="Choose the program the washer will run; the batch is checked against its requirement."
      noProgramText={(w) => `${w.code} has no active washing program. Add one on the machine's page.`}
      scannedNextText="Next: scan the next set, or start the batch when the rack is full."
      result={(batch) => (
        <CardBody>
          <BatchResult status={batch.status} figures={batch.figures} reasons={batch.reasons} requirementText={batch.program.requirementText} size="lg" />
        </CardBody>
      )}
      emptyItemsText="No sets yet. Scan each set as it goes into the rack."
      itemBadges={(i) => <Badge tone={i.state === "washed" ? "ok" : i.state === "reprocess" ? "danger" : "neutral"}>{i.stateLabel}</Badge>}
      finishForm={({ busy, problems, onFinish }) => (
        <Card>
          <CardHeader title="Close with the record" description="When the washer has finished: its time/temperature record decides the advisory check." />
          <CardBody className="space-y-4">
            <RecordForm busy={busy} problems={problems} onSubmit={(record) => onFinish({ record })} />
            <AdvisoryNote />
          </CardBody>
        </Card>
      )}
    />
  );
}
