"use client";

import { useRouter } from "next/navigation";
import { useState, useTransition } from "react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { Input } from "@/components/ui/input";
import { planDayAction, publishPlanAction } from "@/lib/dispatch/actions";

/** Plan (or plan again) with a seed, and publish. */
export function PlanActions({ day, seed, hasPlan, status }: { day: string; seed: number; hasPlan: boolean; status: "draft" | "published" | null }) {
  const router = useRouter();
  const [seedText, setSeedText] = useState(String(seed));
  const [pending, start] = useTransition();

  const plan = () =>
    start(async () => {
      const result = await planDayAction({ day, seed: Number(seedText) });
      if (!result.ok) {
        toast.error(result.error.fields?.seed?.[0] ?? result.error.message);
        return;
      }
      toast.success(result.data.unassigned > 0 ? `Planned: ${result.data.unassigned} stop(s) could not be placed — see below.` : "Planned: every stop is on a run.");
      router.refresh();
    });
  const publish = () =>
    start(async () => {
      const result = await publishPlanAction({ day });
      if (!result.ok) {
        toast.error(result.error.message);
        return;
      }
      const { notifiedStops, withdrawnStops, messages } = result.data;
      const withdrawnText = withdrawnStops > 0 ? ` ${withdrawnStops} site(s) told their visit is off the runs.` : "";
      toast.success(
        messages > 0
          ? `Published. ${notifiedStops} site(s) told their expected time.${withdrawnText} ${messages} e-mail(s) queued.`
          : "Published. No site's time changed, so no e-mail was sent.",
      );
      router.refresh();
    });

  return (
    <div className="flex flex-wrap items-end gap-2">
      <label className="text-sm text-ink-soft">
        <span className="block text-xs font-medium">Planner seed</span>
        <Input value={seedText} onChange={(e) => setSeedText(e.target.value)} inputMode="numeric" className="w-28" aria-describedby="seed-hint" disabled={pending} />
      </label>
      <span id="seed-hint" className="sr-only">
        The same seed and stops give the same proposal; another seed may find another.
      </span>
      <Button onClick={plan} disabled={pending}>
        {hasPlan ? "Plan again" : "Plan the day"}
      </Button>
      <Button variant="accent" onClick={publish} disabled={pending || !hasPlan}>
        {status === "published" ? "Publish changes" : "Publish"}
      </Button>
    </div>
  );
}
