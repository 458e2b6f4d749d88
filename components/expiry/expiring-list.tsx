"use client";

import { useQuery } from "@tanstack/react-query";
import { useState } from "react";
import { Field } from "@/components/ui/field";
import { Select } from "@/components/ui/input";
import { formatLocalDate } from "@/lib/expiry/dates";
import { EXPIRY_DAY_CHOICES } from "@/lib/expiry/schemas";
import type { ExpiringList as ExpiringListData } from "@/lib/expiry/service";
import { fetchJson, toQueryString } from "@/lib/fetch-json";
import { ExpiryBadge } from "./expiry-badge";
import { SendBackButton } from "./send-back-button";

/** The full nearing-expiry list with its look-ahead, each row with its send-back button. */
export function ExpiringList({ initial, timeZone, showSite }: { initial: ExpiringListData; timeZone: string; showSite: boolean }) {
  const [days, setDays] = useState(initial.days);
  const list = useQuery({
    queryKey: ["expiring", days],
    queryFn: () => fetchJson<ExpiringListData>(`/api/expiring${toQueryString({ days })}`),
    initialData: days === initial.days ? initial : undefined,
    refetchInterval: 60_000,
  });
  const rows = list.data?.rows ?? [];
  return (
    <div className="space-y-4">
      <Field id="expiring-days" label="Look ahead" className="max-w-xs">
        <Select id="expiring-days" value={days} onChange={(e) => setDays(Number(e.target.value))}>
          {EXPIRY_DAY_CHOICES.map((d) => (
            <option key={d} value={d}>
              {d} days
            </option>
          ))}
        </Select>
      </Field>
      {list.error && (
        <p role="alert" className="text-sm text-danger-700">
          {list.error.message}
        </p>
      )}
      <div className="overflow-hidden rounded-card border border-line bg-surface shadow-card">
        {rows.length === 0 ? (
          <p className="px-5 py-10 text-center text-sm text-muted">
            {list.isFetching ? "Loading…" : `No delivered set expires within ${days} days. Nothing to send back.`}
          </p>
        ) : (
          <ul className="divide-y divide-line" aria-label="Sets nearing expiry">
            {rows.map((r) => (
              <li key={r.cycleId} className="flex flex-col gap-3 px-5 py-4 sm:flex-row sm:items-center sm:justify-between" data-testid="expiring-set">
                <div className="min-w-0">
                  <p className="font-medium text-ink">
                    {r.serial} <span className="font-normal text-ink-soft">— {r.setName}</span>
                  </p>
                  <p className="mt-1 flex flex-wrap items-center gap-2 text-sm text-muted">
                    <ExpiryBadge row={r} />
                    <span>Use by {formatLocalDate(r.expiresOn)}</span>
                    {showSite && <span>· {r.siteName}</span>}
                  </p>
                </div>
                <SendBackButton cycleId={r.cycleId} serial={r.serial} timeZone={timeZone} />
              </li>
            ))}
          </ul>
        )}
      </div>
    </div>
  );
}
