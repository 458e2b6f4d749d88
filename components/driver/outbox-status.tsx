"use client";

import { useRouter } from "next/navigation";
import { useCallback } from "react";
import { useOutbox } from "./use-outbox";
import { WaitingToSend } from "./waiting-to-send";

/** The run sheet's view of the phone's outbox: everything still waiting to be sent, from any stop; the sheet reloads as items arrive. */
export function OutboxStatus() {
  const router = useRouter();
  const outbox = useOutbox(useCallback(() => router.refresh(), [router]));
  return <WaitingToSend items={outbox.items} onSend={outbox.flush} />;
}
