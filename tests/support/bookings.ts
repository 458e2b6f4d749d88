import { bookingSchema } from "@/lib/orders/schemas";
import { bookPickup, getOrderDetail, type OrderDetail } from "@/lib/orders/service";
import type { DemoDatabase } from "./demo-database";
import { sessionUser } from "./session";

export interface BookedPickup {
  orderId: number;
  reference: string;
  /** The order's cycles, one per set, as the clinic sees them. */
  cycles: OrderDetail["cycles"];
}

/**
 * A standard pickup of the sets at a demo site (named as in the seed), booked at `now` by the
 * user with that e-mail: collection on 2 December 2026 from 09:00 to 12:00, sets needed back by
 * 9 December 17:00 (the unit's local time), no extras, no heavy soil.
 */
export async function bookedPickup(t: DemoDatabase, email: string, siteName: string, setIds: number[], now: Date): Promise<BookedPickup> {
  const userId = t.seed.users[email];
  const siteId = t.seed.sites[siteName];
  if (userId === undefined) throw new Error(`The demo has no user ${email}.`);
  if (siteId === undefined) throw new Error(`The demo has no site named "${siteName}".`);
  const staff = await sessionUser(t.db, userId);
  const { orderId, reference } = await bookPickup(
    t.db,
    staff,
    bookingSchema.parse({
      siteId,
      setIds,
      extras: [],
      collectionFrom: "2026-12-02T09:00",
      collectionUntil: "2026-12-02T12:00",
      neededBackBy: "2026-12-09T17:00",
      serviceLevel: "standard",
      heavySoil: false,
      notes: "",
    }),
    now,
  );
  const { cycles } = await getOrderDetail(t.db, staff, orderId);
  return { orderId, reference, cycles };
}
