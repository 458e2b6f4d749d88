"use client";

import { ArrowDown, ArrowUp, Lock, LockOpen } from "lucide-react";
import { useRouter } from "next/navigation";
import { useId, useState, useTransition } from "react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { Select } from "@/components/ui/input";
import { lockStopAction, moveStopAction } from "@/lib/dispatch/actions";

export interface VanChoice {
  vanId: number;
  label: string;
}

/** Move a stop up or down its run, to another van or off the runs, and lock it in place. */
export function StopControls({
  stopId,
  vanId,
  position,
  count,
  locked,
  vans,
  siteName,
}: {
  stopId: number;
  vanId: number | null;
  position: number | null;
  count: number;
  locked: boolean;
  vans: VanChoice[];
  siteName: string;
}) {
  const router = useRouter();
  const [pending, start] = useTransition();
  const [target, setTarget] = useState(vanId === null ? "" : String(vanId));
  const selectId = useId();

  const move = (toVan: number | null, toPosition: number) =>
    start(async () => {
      const result = await moveStopAction({ stopId, vanId: toVan, position: toPosition });
      if (!result.ok) {
        toast.error(result.error.message);
        return;
      }
      if (result.data.violations.length > 0) toast.warning(result.data.violations.join(" "));
      else toast.success(toVan === null ? `${siteName} taken off the runs.` : `${siteName} moved and locked.`);
      router.refresh();
    });
  const lock = () =>
    start(async () => {
      const result = await lockStopAction({ stopId, locked: !locked });
      if (!result.ok) toast.error(result.error.message);
      else router.refresh();
    });

  return (
    <div className="flex flex-wrap items-center gap-1.5">
      {vanId !== null && position !== null && (
        <>
          <Button size="sm" variant="ghost" disabled={pending || position <= 1} onClick={() => move(vanId, position - 1)} aria-label={`Move ${siteName} earlier`}>
            <ArrowUp className="h-4 w-4" aria-hidden="true" />
          </Button>
          <Button size="sm" variant="ghost" disabled={pending || position >= count} onClick={() => move(vanId, position + 1)} aria-label={`Move ${siteName} later`}>
            <ArrowDown className="h-4 w-4" aria-hidden="true" />
          </Button>
        </>
      )}
      <label htmlFor={selectId} className="sr-only">
        Van for {siteName}
      </label>
      <Select id={selectId} value={target} onChange={(e) => setTarget(e.target.value)} className="h-8 w-36 text-xs" disabled={pending}>
        <option value="">Off the runs</option>
        {vans.map((v) => (
          <option key={v.vanId} value={v.vanId}>
            {v.label}
          </option>
        ))}
      </Select>
      <Button
        size="sm"
        variant="secondary"
        disabled={pending || target === (vanId === null ? "" : String(vanId))}
        onClick={() => move(target === "" ? null : Number(target), 500)}
      >
        Move
      </Button>
      {vanId !== null && (
        <Button size="sm" variant="ghost" disabled={pending} onClick={lock} aria-pressed={locked} aria-label={locked ? `Unlock ${siteName}` : `Lock ${siteName} in place`}>
          {locked ? <Lock className="h-4 w-4" aria-hidden="true" /> : <LockOpen className="h-4 w-4" aria-hidden="true" />}
          <span className="text-xs">{locked ? "Locked" : "Lock"}</span>
        </Button>
      )}
    </div>
  );
}
