"use server";

import { defineAction } from "@/lib/http/action";
import { amendBookingSchema, bookingSchema, cancelOrderSchema, storeRequestSchema } from "./schemas";
import { amendPickup, bookPickup, cancelPickup } from "./service";
import { requestFromStore } from "./store-requests";

// Server actions for booking, amending and cancelling pickups.

export const bookPickupAction = defineAction("orders.book", bookingSchema, ({ db, user }, input) => bookPickup(db, user, input));

export const amendPickupAction = defineAction("orders.book", amendBookingSchema, async ({ db, user }, { orderId, ...input }) => {
  await amendPickup(db, user, orderId, input);
  return { orderId };
});

export const cancelPickupAction = defineAction("orders.book", cancelOrderSchema, async ({ db, user }, input) => {
  await cancelPickup(db, user, input);
  return { orderId: input.orderId };
});


export const requestFromStoreAction = defineAction("orders.book", storeRequestSchema, ({ db, user }, input) => requestFromStore(db, user, input));
