import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { StopScreen } from "@/components/driver/stop-screen";
import { getDb } from "@/db";
import { requirePermission } from "@/lib/auth/current-user";
import { serverEnv } from "@/lib/env";
import { AppError } from "@/lib/errors";
import { getRunSheet } from "@/lib/runs/service";

export const metadata: Metadata = { title: "Stop" };

const ID = /^[1-9]\d{0,15}$/;

// One stop of the driver's run: scan, sign, or say why it could not be served. Another driver's run is a 404.
export default async function StopPage({ params }: { params: Promise<{ runId: string; stopId: string }> }) {
  const user = await requirePermission("runs.work");
  const { runId, stopId } = await params;
  if (!ID.test(runId) || !ID.test(stopId)) notFound();
  const sheet = await getRunSheet(getDb(), user, Number(runId)).catch((error: unknown) => {
    if (error instanceof AppError && error.code === "not_found") return null;
    throw error;
  });
  const stop = sheet?.stops.find((s) => s.id === Number(stopId));
  if (!sheet || !stop) notFound();
  return (
    <div className="mx-auto max-w-xl">
      <StopScreen runId={sheet.runId} initialStop={stop} stopCount={sheet.stops.length} timeZone={serverEnv().UNIT_TIME_ZONE} />
    </div>
  );
}
