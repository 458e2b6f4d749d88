import { toLocalDateTimeText } from "@/lib/local-time";
import type { BookingInput } from "./schemas";
import type { OrderDetail } from "./service";

// Starting values of the booking form: collection tomorrow morning, needed back two days later.

export function newBookingDefaults(siteId: number, now: Date, timeZone: string): BookingInput {
  const day = (offset: number, hh: number) => {
    const local = toLocalDateTimeText(new Date(now.getTime() + offset * 86_400_000), timeZone).slice(0, 10);
    return `${local}T${String(hh).padStart(2, "0")}:00`;
  };
  return {
    siteId,
    setIds: [],
    extras: [],
    collectionFrom: day(1, 9),
    collectionUntil: day(1, 12),
    neededBackBy: day(3, 17),
    serviceLevel: "standard",
    heavySoil: false,
    keepInStore: false,
    notes: "",
  };
}

/** The form's values for changing a booked order. */
export function amendDefaults(order: OrderDetail, timeZone: string): BookingInput {
  const text = (iso: string | null) => (iso ? toLocalDateTimeText(new Date(iso), timeZone) : "");
  return {
    siteId: order.siteId,
    setIds: order.cycles.filter((c) => c.state === "booked").map((c) => c.setId),
    extras: order.extras,
    collectionFrom: text(order.collectionFrom),
    collectionUntil: text(order.collectionUntil),
    neededBackBy: text(order.neededBackBy),
    serviceLevel: order.serviceLevel,
    heavySoil: order.heavySoil,
    keepInStore: order.keepInStore,
    notes: order.notes ?? "",
  };
}
