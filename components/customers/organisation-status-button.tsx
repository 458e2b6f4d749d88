"use client";

import { useRouter } from "next/navigation";
import { useTransition } from "react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { setOrganisationActiveAction } from "@/lib/organisations/actions";

/** Switches a customer off (nobody there can sign in) or on again. */
export function OrganisationStatusButton({ id, active, name }: { id: number; active: boolean; name: string }) {
  const router = useRouter();
  const [pending, start] = useTransition();
  return (
    <Button
      variant={active ? "ghost" : "secondary"}
      disabled={pending}
      onClick={() =>
        start(async () => {
          if (active && !window.confirm(`Switch off ${name}? Nobody at ${name} will be able to sign in.`)) return;
          const result = await setOrganisationActiveAction({ id, active: !active });
          if (result.ok) toast.success(active ? `${name} switched off` : `${name} switched on`);
          else toast.error(result.error.message);
          router.refresh();
        })
      }
    >
      {active ? "Switch off" : "Switch on"}
    </Button>
  );
}
