"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { toast } from "sonner";
import { postJson } from "@/components/stations/post";
import { Button } from "@/components/ui/button";

/** Records that a recalled set is back at the unit (it goes back to washing). */
export function RecallReturnButton({ recallId, cycleId, serial }: { recallId: number; cycleId: number; serial: string }) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  return (
    <Button
      variant="secondary"
      size="sm"
      disabled={busy}
      aria-label={`${serial} is back at the unit`}
      onClick={async () => {
        setBusy(true);
        const res = await postJson(`/api/recalls/${recallId}/return`, { cycleId });
        setBusy(false);
        if (!res.ok) return toast.error(res.message);
        toast.success(`${serial} is back at the unit`);
        router.refresh();
      }}
    >
      Back at the unit
    </Button>
  );
}
