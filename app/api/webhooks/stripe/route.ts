// POST /api/webhooks/stripe — events from the payment service, authenticated by their signature
import { NextResponse } from "next/server";
import type Stripe from "stripe";
import { getDb } from "@/db";
import { handleStripeEvent } from "@/lib/billing/webhooks";
import { stripeClient, webhookSecret } from "@/lib/stripe";

// Not wrapped in withAuth: the caller is the payment service, not a signed-in person. The raw
// body is verified with the SDK before anything is read from it; a bad or missing signature
// answers 400 and changes nothing. Any other failure answers 500, so the service retries.

export const dynamic = "force-dynamic";

function problem(status: number, code: string, message: string) {
  return NextResponse.json({ error: { code, message } }, { status });
}

export async function POST(req: Request): Promise<Response> {
  const raw = await req.text();
  const signature = req.headers.get("stripe-signature");
  if (!signature) return problem(400, "invalid", "The Stripe-Signature header is missing.");
  let secret: string;
  try {
    secret = webhookSecret();
  } catch (error) {
    console.error(error);
    return problem(503, "unavailable", "Webhooks are not configured on this server.");
  }
  let event: Stripe.Event;
  try {
    event = stripeClient().webhooks.constructEvent(raw, signature, secret);
  } catch (error) {
    const message = error instanceof Error ? error.message : String(error);
    return problem(400, "invalid", `The signature does not match this body: ${message}`);
  }
  try {
    const outcome = await handleStripeEvent(getDb(), event);
    return NextResponse.json({ received: true, ...outcome });
  } catch (error) {
    console.error(`webhook ${event.id} (${event.type}) failed:`, error);
    return problem(500, "internal", "The event could not be processed; it was not recorded, so a retry will process it.");
  }
}
