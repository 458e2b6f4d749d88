"use client";

import { CloudOff, RefreshCw } from "lucide-react";
import { Button } from "@/components/ui/button";
import type { OutboxItem } from "./outbox";

/** The strip that says what the phone still has to send, and lets the driver try at once. */
export function WaitingToSend({ items, onSend }: { items: OutboxItem[]; onSend: () => void }) {
  if (items.length === 0) return null;
  const last = items[0]?.lastError;
  return (
    <div role="status" data-testid="waiting-to-send" className="rounded-card border-2 border-warn-600/40 bg-warn-50 px-4 py-3 text-warn-700">
      <div className="flex items-center justify-between gap-3">
        <p className="flex items-center gap-2 text-base font-semibold">
          <CloudOff className="h-5 w-5 shrink-0" aria-hidden="true" />
          Waiting to send ({items.length})
        </p>
        <Button variant="secondary" size="sm" onClick={onSend}>
          <RefreshCw className="h-4 w-4" aria-hidden="true" /> Send now
        </Button>
      </div>
      <p className="mt-1 text-sm">
        Kept on this phone and sent by itself when the connection is back, each one once.{last ? ` Last try: ${last}` : ""}
      </p>
      <ul className="mt-2 space-y-0.5 text-sm">
        {items.slice(0, 6).map((i) => (
          <li key={i.id}>· {i.label}</li>
        ))}
        {items.length > 6 && <li>· and {items.length - 6} more</li>}
      </ul>
    </div>
  );
}
