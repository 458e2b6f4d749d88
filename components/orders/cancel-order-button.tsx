"use client";

import { useRouter } from "next/navigation";
import { useTransition } from "react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { cancelPickupAction } from "@/lib/orders/actions";

export function CancelOrderButton({ orderId, reference }: { orderId: number; reference: string }) {
  const router = useRouter();
  const [pending, start] = useTransition();
  return (
    <Button
      variant="danger"
      disabled={pending}
      onClick={() =>
        start(async () => {
          if (!window.confirm(`Cancel pickup ${reference}? The van will not come for these sets.`)) return;
          const result = await cancelPickupAction({ orderId });
          if (result.ok) toast.success(`${reference} cancelled`);
          else toast.error(result.error.message);
          router.refresh();
        })
      }
    >
      Cancel pickup
    </Button>
  );
}
