import type { IncomingMessage, ServerResponse } from "node:http";
import { ZodError } from "zod";
import type { FakeCore } from "./core";
import { parseControlBody, sendJson } from "./http-util";
import { cardFromFields, payCheckoutByCard, payInvoiceByCard, statusOf } from "./hosted";
import { renderCheckoutSession } from "./resources/checkout";
import { renderInvoice } from "./resources/invoices";

// Control routes for tests and the demo, under /_fake/ (no API key needed):
//   GET  /_fake/health                       liveness and counts
//   POST /_fake/reset                        forget everything (state, keys, log, faults)
//   GET  /_fake/requests[?method=&path=]     the request log, oldest first; DELETE clears it
//   POST /_fake/faults                       { mode, count?, path?, method?, status?, delay_ms?, phase?, message? }
//   GET  /_fake/faults, DELETE /_fake/faults the faults still pending; drop them
//   GET  /_fake/webhooks                     the webhook endpoint and every delivery with its attempts
//   POST /_fake/webhook-endpoint             { url, secret? } sets where events go; DELETE stops sending
//   POST /_fake/events/:id/redeliver         { url?, secret? } sends a stored event again, answers when settled
//   POST /_fake/invoices/:id/pay             { number, exp_month?, exp_year?, cvc? } a card attempt, like the hosted page
//   POST /_fake/checkout/sessions/:id/complete  the same for a Checkout session

export async function handleControl(
  core: FakeCore,
  req: IncomingMessage,
  res: ServerResponse,
  url: URL,
  body: string,
  info: () => Record<string, unknown>,
): Promise<void> {
  const method = req.method ?? "GET";
  const parts = url.pathname.split("/").filter(Boolean).slice(1); // after "_fake"
  let input: Record<string, unknown>;
  try {
    input = parseControlBody(body, req.headers["content-type"]);
  } catch (e) {
    return sendJson(res, 400, { error: { message: `The body is not valid JSON: ${(e as Error).message}` } });
  }
  const route = `${method} /${parts.map((p, i) => (i > 0 && /^(evt|in|cs)_/.test(p) ? ":id" : p)).join("/")}`;
  const id = parts.find((p) => /^(evt|in|cs)_/.test(p)) ?? "";

  switch (route) {
    case "GET /health":
      return sendJson(res, 200, { status: "ok", ...info() });
    case "POST /reset":
      core.reset();
      return sendJson(res, 200, { reset: true });
    case "GET /requests": {
      const m = url.searchParams.get("method");
      const p = url.searchParams.get("path");
      const data = core.requestLog.filter((e) => (!m || e.method === m.toUpperCase()) && (!p || e.path.startsWith(p)));
      return sendJson(res, 200, { data });
    }
    case "DELETE /requests":
      core.requestLog.length = 0;
      return sendJson(res, 200, { cleared: true });
    case "POST /faults":
      try {
        return sendJson(res, 200, core.faults.add(input));
      } catch (e) {
        if (e instanceof ZodError) {
          const problems = e.issues.map((i) => `${i.path.join(".") || "body"}: ${i.message}`).join("; ");
          return sendJson(res, 400, { error: { message: `Bad fault: ${problems}` } });
        }
        throw e;
      }
    case "GET /faults":
      return sendJson(res, 200, { data: core.faults.list() });
    case "DELETE /faults":
      core.faults.clear();
      return sendJson(res, 200, { cleared: true });
    case "GET /webhooks":
      return sendJson(res, 200, {
        endpoint: core.endpoint?.url ?? null,
        pending: core.dispatcher.pending(),
        data: core.dispatcher.deliveries(),
      });
    case "POST /webhook-endpoint": {
      const target = typeof input.url === "string" ? input.url : "";
      if (!/^https?:\/\//.test(target)) return sendJson(res, 400, { error: { message: "Give url: the http(s) address that receives the events." } });
      const secret = typeof input.secret === "string" && input.secret !== "" ? input.secret : core.endpoint?.secret;
      if (!secret) return sendJson(res, 400, { error: { message: "Give secret: the whsec_… signing secret." } });
      core.endpoint = { url: target, secret };
      return sendJson(res, 200, { endpoint: target });
    }
    case "DELETE /webhook-endpoint":
      core.endpoint = null;
      return sendJson(res, 200, { endpoint: null });
    case "POST /events/:id/redeliver": {
      const target = typeof input.url === "string" ? { url: input.url, secret: String(input.secret ?? core.endpoint?.secret ?? "") } : core.endpoint;
      if (!target || !target.secret) return sendJson(res, 400, { error: { message: "No webhook endpoint is configured; give url and secret." } });
      const delivery = core.redeliver(id, target);
      if (!delivery) return sendJson(res, 404, { error: { message: `No such event: '${id}'` } });
      return sendJson(res, 200, await delivery);
    }
    case "POST /invoices/:id/pay": {
      const row = core.state.invoices.get(id);
      if (!row) return sendJson(res, 404, { error: { type: "invalid_request_error", code: "resource_missing", message: `No such invoice: '${id}'` } });
      const ctx = core.ctx({ id: null, idempotency_key: null });
      const result = payInvoiceByCard(core, row, cardFromFields(input, new Date(ctx.now * 1000), true));
      return sendJson(res, statusOf(result), { ...result, invoice: renderInvoice(core.ctx({ id: null, idempotency_key: null }), row) });
    }
    case "POST /checkout/sessions/:id/complete": {
      const row = core.state.checkoutSessions.get(id);
      if (!row) return sendJson(res, 404, { error: { type: "invalid_request_error", code: "resource_missing", message: `No such checkout.session: '${id}'` } });
      const ctx = core.ctx({ id: null, idempotency_key: null });
      const result = payCheckoutByCard(core, row, cardFromFields(input, new Date(ctx.now * 1000), true));
      return sendJson(res, statusOf(result), { ...result, session: renderCheckoutSession(core.ctx({ id: null, idempotency_key: null }), row) });
    }
    default:
      return sendJson(res, 404, { error: { message: `Unknown control route ${method} ${url.pathname}. See fakes/stripe/control.ts for the list.` } });
  }
}
