"use client";

import { RotateCcw } from "lucide-react";
import Link from "next/link";
import { useState, useTransition } from "react";
import { toast } from "sonner";
import { Button } from "@/components/ui/button";
import { sendBackAction } from "@/lib/expiry/actions";
import { formatDateTime } from "@/lib/format";

/**
 * One click: books a pickup of this set at the site's next opening; shows why when it cannot. The
 * row keeps the booked reference until the list next refreshes, which drops the set.
 */
export function SendBackButton({ cycleId, serial, timeZone }: { cycleId: number; serial: string; timeZone: string }) {
  const [pending, start] = useTransition();
  const [problem, setProblem] = useState<string | null>(null);
  const [booked, setBooked] = useState<{ orderId: number; reference: string } | null>(null);
  if (booked) {
    return (
      <p className="text-sm text-ok-700">
        Pickup{" "}
        <Link href={`/clinic/orders/${booked.orderId}`} className="font-medium underline">
          {booked.reference}
        </Link>{" "}
        booked
      </p>
    );
  }
  return (
    <div className="space-y-1">
      <Button
        variant="secondary"
        className="min-h-11 w-full sm:w-auto"
        disabled={pending}
        aria-label={`Send ${serial} back for reprocessing`}
        onClick={() =>
          start(async () => {
            setProblem(null);
            const result = await sendBackAction({ cycleId });
            if (!result.ok) {
              setProblem(result.error.message);
              return;
            }
            setBooked(result.data);
            toast.success(`${serial}: pickup ${result.data.reference} booked for ${formatDateTime(result.data.collectionFrom, timeZone)}`);
          })
        }
      >
        <RotateCcw className="h-4 w-4" aria-hidden="true" />
        {pending ? "Booking…" : "Send back for reprocessing"}
      </Button>
      {problem && (
        <p role="alert" className="max-w-sm text-xs font-medium text-danger-700">
          {problem}
        </p>
      )}
    </div>
  );
}
