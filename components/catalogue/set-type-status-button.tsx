"use client";

import { useQueryClient } from "@tanstack/react-query";
import { useRouter } from "next/navigation";
import { useState } from "react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { setSetTypeActiveAction } from "@/lib/catalogue/actions";

/** Takes a set type out of the catalogue or puts it back; its sets and history stay. */
export function SetTypeStatusButton({ setTypeId, active, name }: { setTypeId: number; active: boolean; name: string }) {
  const [busy, setBusy] = useState(false);
  const router = useRouter();
  const queryClient = useQueryClient();
  const run = async () => {
    if (active && !window.confirm(`Take ${name} out of the catalogue? Clinics can no longer book it; its sets and history stay.`)) return;
    setBusy(true);
    const result = await setSetTypeActiveAction({ setTypeId, active: !active });
    setBusy(false);
    if (!result.ok) {
      toast.error(result.error.message);
      return;
    }
    toast.success(active ? `${name} is now inactive` : `${name} is active again`);
    await queryClient.invalidateQueries({ queryKey: ["set-types"] });
    router.refresh();
  };
  return (
    <Button variant={active ? "ghost" : "secondary"} disabled={busy} onClick={run}>
      {active ? "Deactivate" : "Reactivate"}
    </Button>
  );
}
