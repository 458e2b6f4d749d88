import { Clock, MapPin, Phone } from "lucide-react";
import { Badge } from "@/components/ui/badge";
import { Card } from "@/components/ui/card";
import { formatDayHours, WEEKDAY_LABELS, WEEKDAYS, type Weekday } from "@/lib/sites/opening-hours";
import type { SiteView } from "@/lib/sites/queries";

/** Sites as cards: address, today's hours, contact, delivery notes; optionally the whole week. */
export function SiteCards({ sites, today, showWeek = false, showOrganisation = false }: {
  sites: SiteView[];
  today: Weekday;
  showWeek?: boolean;
  showOrganisation?: boolean;
}) {
  if (sites.length === 0) return <p className="text-sm text-muted">No sites yet.</p>;
  return (
    <ul className="grid gap-4 md:grid-cols-2">
      {sites.map((site) => (
        <li key={site.id}>
          <Card className="h-full p-5">
            <div className="flex items-start justify-between gap-2">
              <div>
                {showOrganisation && <p className="text-xs font-medium uppercase tracking-wide text-muted">{site.organisationName}</p>}
                <h3 className="font-semibold text-ink">{site.name}</h3>
              </div>
              {site.isDepot && <Badge tone="info">Unit depot</Badge>}
            </div>
            <p className="mt-2 flex gap-2 text-sm text-ink-soft">
              <MapPin className="mt-0.5 h-4 w-4 shrink-0 text-muted" aria-hidden="true" />
              {site.addressLine1}, {site.town} {site.postcode}
            </p>
            <p className="mt-1 flex gap-2 text-sm text-ink-soft">
              <Clock className="mt-0.5 h-4 w-4 shrink-0 text-muted" aria-hidden="true" />
              Today: {formatDayHours(site.openingHours[today])}
            </p>
            {site.contactName && (
              <p className="mt-1 flex gap-2 text-sm text-ink-soft">
                <Phone className="mt-0.5 h-4 w-4 shrink-0 text-muted" aria-hidden="true" />
                {site.contactName}
                {site.contactPhone ? `, ${site.contactPhone}` : ""}
              </p>
            )}
            {site.deliveryNotes && <p className="mt-3 rounded-lg bg-paper px-3 py-2 text-sm text-ink-soft">{site.deliveryNotes}</p>}
            {showWeek && (
              <dl className="mt-3 grid grid-cols-[6rem_1fr] gap-x-2 gap-y-0.5 text-sm">
                {WEEKDAYS.map((d) => (
                  <div key={d} className="contents">
                    <dt className={d === today ? "font-semibold" : "text-muted"}>{WEEKDAY_LABELS[d]}</dt>
                    <dd className={d === today ? "font-semibold" : ""}>{formatDayHours(site.openingHours[d])}</dd>
                  </div>
                ))}
              </dl>
            )}
          </Card>
        </li>
      ))}
    </ul>
  );
}
