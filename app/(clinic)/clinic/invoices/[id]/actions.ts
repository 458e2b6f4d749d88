"use server";

import { z } from "zod";
import { startOnlinePayment } from "@/lib/billing/payments";
import { defineAction } from "@/lib/http/action";

// "Pay online": the invoice's page at the payment service, made on demand when it has none yet.
export const startPaymentAction = defineAction("invoices.pay", z.object({ invoiceId: z.number().int().positive() }), ({ db, user }, input) =>
  startOnlinePayment(db, user, input.invoiceId),
);
