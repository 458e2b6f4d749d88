"use client";

import { useRouter } from "next/navigation";
import { useState } from "react";
import { toast } from "sonner";
import { postJson } from "@/components/stations/post";
import { Button } from "@/components/ui/button";
import { Field } from "@/components/ui/field";
import { Textarea } from "@/components/ui/input";
import type { BiResult, LoadStatus } from "@/db/schema";

// The quality lead's decision on a load: release it (documenting an early release of an implant
// load whose biological indicator is still incubating), fail it, or read its biological indicator.
// Failing a released load recalls it.

export function ReleaseActions({
  loadId,
  loadNumber,
  status,
  containsImplant,
  biResult,
  canRelease,
}: {
  loadId: number;
  loadNumber: string;
  status: LoadStatus;
  containsImplant: boolean;
  biResult: BiResult | null;
  canRelease: boolean;
}) {
  const router = useRouter();
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [early, setEarly] = useState(false);
  const [earlyReason, setEarlyReason] = useState("");
  const [failing, setFailing] = useState(false);
  const [failReason, setFailReason] = useState("");

  const run = async (url: string, body: unknown, done: string, after?: (data: Record<string, unknown>) => void) => {
    setBusy(true);
    setError(null);
    const res = await postJson<Record<string, unknown>>(url, body);
    setBusy(false);
    if (!res.ok) return setError(Object.values(res.fields)[0]?.[0] ?? res.message);
    toast.success(done);
    after?.(res.data);
    router.refresh();
  };

  const awaitingBi = containsImplant && biResult === "pending";
  return (
    <div className="space-y-4" data-testid={`release-actions-${loadNumber}`}>
      {error && (
        <p role="alert" className="rounded-lg border-2 border-danger-600 bg-danger-50 p-3 text-base text-danger-700" data-testid="release-error">
          {error}
        </p>
      )}
      {biResult === "pending" && (
        <div className="flex flex-wrap items-center gap-3">
          <span className="text-sm text-ink-soft">Biological indicator read-out:</span>
          <Button variant="secondary" disabled={busy} onClick={() => run(`/api/loads/${loadId}/bi`, { result: "pass" }, `Load ${loadNumber}: no growth recorded`)}>
            No growth
          </Button>
          <Button variant="secondary" disabled={busy} onClick={() => run(`/api/loads/${loadId}/bi`, { result: "fail" }, `Load ${loadNumber}: growth recorded`)}>
            Growth
          </Button>
        </div>
      )}
      {status === "awaiting_release" && (
        <>
          {awaitingBi && (
            <label className="flex items-center gap-2 text-sm">
              <input type="checkbox" checked={early} onChange={(e) => setEarly(e.target.checked)} /> Release before the biological indicator is read (documented early release)
            </label>
          )}
          {early && (
            <Field id={`early-${loadId}`} label="Why the sets are needed now" hint="Kept with the load, with your name.">
              <Textarea id={`early-${loadId}`} value={earlyReason} onChange={(e) => setEarlyReason(e.target.value)} />
            </Field>
          )}
          <div className="flex flex-wrap gap-3">
            <Button
              size="lg"
              variant="accent"
              disabled={busy || (!canRelease && !early)}
              onClick={() => run(`/api/loads/${loadId}/release`, early ? { earlyReleaseReason: earlyReason } : {}, `Load ${loadNumber} released`)}
            >
              Release load {loadNumber}
            </Button>
            <Button size="lg" variant="secondary" disabled={busy} onClick={() => setFailing(true)}>
              Fail the load…
            </Button>
          </div>
        </>
      )}
      {status === "released" && !failing && (
        <Button size="lg" variant="danger" disabled={busy} onClick={() => setFailing(true)}>
          Fail this released load and recall its sets…
        </Button>
      )}
      {failing && (
        <div className="space-y-3 rounded-lg border border-line p-4">
          <Field
            id={`fail-${loadId}`}
            label="Why the load fails"
            hint={status === "released" ? "Every set of the load is recalled and each affected customer is e-mailed." : "Its sets go back to washing."}
          >
            <Textarea id={`fail-${loadId}`} value={failReason} onChange={(e) => setFailReason(e.target.value)} />
          </Field>
          <div className="flex flex-wrap gap-3">
            <Button
              variant="danger"
              size="lg"
              disabled={busy}
              onClick={() =>
                run(`/api/loads/${loadId}/fail`, { reason: failReason }, status === "released" ? `Load ${loadNumber} failed: sets recalled` : `Load ${loadNumber} failed`, (data) => {
                  if (typeof data.recallId === "number") router.push(`/unit/recalls/${data.recallId}`);
                })
              }
            >
              {status === "released" ? "Fail and recall" : "Fail the load"}
            </Button>
            <Button variant="secondary" size="lg" onClick={() => setFailing(false)}>
              Cancel
            </Button>
          </div>
        </div>
      )}
    </div>
  );
}
