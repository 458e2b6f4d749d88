import type { Ctx } from "../context";
import { invalidParam } from "../errors";
import { paginate, readListQuery } from "../list";
import { inRange, type Params } from "../params";
import { newestFirst } from "../state";
import { copy, rowOf } from "./common";

// GET /v1/events, GET /v1/events/:id — every state change the fake made, newest first.

// `type` takes one type or a wildcard such as `invoice.*`; `types[]` several exact types.
function typeMatcher(type: string | undefined, types: string[] | undefined): (t: string) => boolean {
  if (type !== undefined && types !== undefined) {
    throw invalidParam("You may only specify one of these parameters: type, types.", "types", "parameters_exclusive");
  }
  if (types !== undefined) return (t) => types.includes(t);
  if (type === undefined) return () => true;
  if (type.endsWith(".*")) {
    const prefix = type.slice(0, -1);
    return (t) => t.startsWith(prefix);
  }
  return (t) => t === type;
}

export function listEvents(ctx: Ctx, p: Params): object {
  const q = readListQuery(p);
  const matches = typeMatcher(p.string("type"), p.stringArray("types"));
  const created = p.range("created");
  const deliverySuccess = p.boolean("delivery_success");
  p.done();
  const rows = newestFirst(ctx.state.events.values()).filter(
    (r) =>
      matches(r.obj.type) &&
      inRange(r.obj.created, created) &&
      (deliverySuccess === undefined || (r.obj.pending_webhooks === 0) === deliverySuccess),
  );
  return paginate(
    rows.map((r) => copy(r.obj)),
    q,
    "/v1/events",
  );
}

export function retrieveEvent(ctx: Ctx, p: Params, path: Record<string, string>): object {
  p.done();
  return copy(rowOf(ctx.state.events, path.id, "event").obj);
}
