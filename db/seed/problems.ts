import type { Transaction } from "kysely";
import type { Database, ProblemKind } from "@/db/schema";
import { recordAudit } from "@/lib/audit/log";
import { mulberry32, randomInt } from "@/lib/routing/random";
import type { SeedResult } from "./demo";

// The demo's reported problems: a few clinics found something wrong with a set delivered in the
// history, some already answered by the unit, the newest still waiting in the queue. Each is
// reported on a delivered cycle of the ordering history (so it runs after that seed), in a window
// of days before now or, if that site had no delivery then, the latest one before it; a scripted
// problem whose reporter never had a delivery is left out. No e-mail is queued: these answers
// were given before the demo starts. Deterministic: each problem draws its cycle from a generator
// seeded by its position in the script.

const HOUR_MS = 60 * 60 * 1000;
const DAY_MS = 24 * HOUR_MS;

interface ScriptedProblem {
  reporter: string;
  kind: ProblemKind;
  /** Whole-order problems ("other") are not about one set. */
  wholeOrder?: boolean;
  /** The delivery is picked between these many days before now (oldest, newest). */
  deliveredDaysAgo: readonly [number, number];
  /** Hours from the delivery to the report. */
  reportedAfterHours: number;
  description: string;
  answer?: { by: string; afterHours: number; text: string };
}

export const DEMO_PROBLEMS: readonly ScriptedProblem[] = [
  {
    reporter: "theatres@quillby.example",
    kind: "damaged_instrument",
    deliveredDaysAgo: [20, 12],
    reportedAfterHours: 3,
    description:
      "One of the two needle holders does not close fully: the tips no longer meet. Found at the set check before the first case; the set was not used.",
    answer: {
      by: "tech@larkmoor.example",
      afterHours: 4,
      text: "Thank you for setting it aside. The needle holder passed inspection at packing, so the jaws were probably knocked in transit. We collect the set on this afternoon's round, replace the needle holder from the spare stock and send the set back complete tomorrow morning.",
    },
  },
  {
    reporter: "daycase@quillby.example",
    kind: "missing_instrument",
    deliveredDaysAgo: [15, 8],
    reportedAfterHours: 2,
    description: "The contents list says two skin hooks; only one was in the tray. Nothing was found in the transport box either.",
    answer: {
      by: "quality@larkmoor.example",
      afterHours: 20,
      text: "We found the second skin hook in the washer basket of the same batch; it has been reprocessed and goes back to you on tomorrow's van. The packer has been reminded to count against the contents list at packing.",
    },
  },
  {
    reporter: "tanner@marrowgate.example",
    kind: "damaged_instrument",
    deliveredDaysAgo: [25, 10],
    reportedAfterHours: 5,
    description: "The hinge of one cassette is cracked and the lid does not stay shut. The instruments inside looked fine.",
    answer: {
      by: "tech@larkmoor.example",
      afterHours: 6,
      text: "The cassette has reached the end of its life. We will swap it for a new one of the same size at the next collection; until then please keep it closed with the strap we sent.",
    },
  },
  {
    reporter: "manager@pellowfield.example",
    kind: "other",
    wholeOrder: true,
    deliveredDaysAgo: [30, 14],
    reportedAfterHours: 18,
    description: "The delivery came after we had closed and was left with the pharmacy next door. Please deliver within our opening hours or ring first.",
    answer: {
      by: "dispatch@larkmoor.example",
      afterHours: 3,
      text: "Sorry about that: the round ran late after a road closure. We have told the drivers on your round to ring first, and a late round will bring your sets the next morning instead. Adding \"ring first\" to your site's delivery notes makes sure every driver sees it.",
    },
  },
  {
    reporter: "manager@quillby.example",
    kind: "wet_or_torn_pack",
    deliveredDaysAgo: [3, 1],
    reportedAfterHours: 2,
    description: "The outer wrap of this tray is torn at one corner; it was like this when we lifted it out of the transport box. The tray has not been opened or used and is kept aside.",
  },
  {
    reporter: "staff@otterwick.example",
    kind: "wrong_set",
    deliveredDaysAgo: [4, 1],
    reportedAfterHours: 1,
    description: "The label on this tray has our serial number, but the contents do not match our contents list: it looks like a tray of another type.",
  },
  {
    reporter: "theatres@quillby.example",
    kind: "missing_instrument",
    deliveredDaysAgo: [2, 0],
    reportedAfterHours: 1,
    description: "The retractor blade listed on the contents list is missing from the tray. Please check whether it stayed at the unit.",
  },
];

/** Reports the scripted problems on delivered cycles of the history; returns the new problems' ids. */
export async function seedProblems(trx: Transaction<Database>, seed: SeedResult, now: Date): Promise<number[]> {
  const ids: number[] = [];
  const used = new Set<number>();
  for (const [index, script] of DEMO_PROBLEMS.entries()) {
    const reporterId = seed.users[script.reporter];
    if (!reporterId) continue;
    const reporter = await trx.selectFrom("users").select(["organisation_id", "site_id"]).where("id", "=", reporterId).executeTakeFirstOrThrow();
    const [oldest, newest] = script.deliveredDaysAgo;
    // The report (and any answer) must lie before now.
    const latestDelivery = new Date(Math.min(now.getTime() - newest * DAY_MS, now.getTime() - (script.reportedAfterHours + (script.answer?.afterHours ?? 0) + 1) * HOUR_MS));
    let query = trx
      .selectFrom("cycles")
      .innerJoin("orders", "orders.id", "cycles.order_id")
      .select(["cycles.id", "cycles.set_id", "cycles.delivered_at", "orders.id as order_id", "orders.site_id"])
      .where("cycles.organisation_id", "=", reporter.organisation_id)
      .where("cycles.state", "=", "delivered")
      .where("cycles.delivered_at", "<=", latestDelivery.toISOString());
    if (reporter.site_id !== null) query = query.where("orders.site_id", "=", reporter.site_id);
    const earliest = new Date(now.getTime() - oldest * DAY_MS).toISOString();
    const inWindow = (await query.where("cycles.delivered_at", ">=", earliest).orderBy("cycles.delivered_at").orderBy("cycles.id").execute()).filter(
      (c) => !used.has(c.id),
    );
    // With no delivery in its window (a quiet week for that site), the latest one before it.
    const cycle =
      inWindow.length > 0
        ? inWindow[randomInt(mulberry32(0x5e7 + index * 7919), inWindow.length)]!
        : (await query.orderBy("cycles.delivered_at", "desc").orderBy("cycles.id", "desc").limit(20).execute()).find((c) => !used.has(c.id));
    if (!cycle) continue;
    used.add(cycle.id);

    const reportedAt = new Date(new Date(cycle.delivered_at!).getTime() + script.reportedAfterHours * HOUR_MS);
    const answeredAt = script.answer ? new Date(reportedAt.getTime() + script.answer.afterHours * HOUR_MS) : null;
    const answererId = script.answer ? seed.users[script.answer.by] ?? null : null;
    const { id } = await trx
      .insertInto("problems")
      .values({
        organisation_id: reporter.organisation_id,
        site_id: cycle.site_id,
        order_id: cycle.order_id,
        cycle_id: script.wholeOrder ? null : cycle.id,
        set_id: script.wholeOrder ? null : cycle.set_id,
        kind: script.kind,
        description: script.description,
        photo_file_id: null,
        status: script.answer ? "answered" : "open",
        answer: script.answer?.text ?? null,
        answered_by: answererId,
        answered_at: answeredAt?.toISOString() ?? null,
        reported_by: reporterId,
        created_at: reportedAt.toISOString(),
      })
      .returning("id")
      .executeTakeFirstOrThrow();
    await recordAudit(
      trx,
      {
        actorUserId: reporterId,
        organisationId: reporter.organisation_id,
        action: "problem.reported",
        entity: "problem",
        entityId: id,
        details: { kind: script.kind, orderId: cycle.order_id, cycleId: script.wholeOrder ? null : cycle.id, setId: script.wholeOrder ? null : cycle.set_id, photoFileId: null },
      },
      reportedAt,
    );
    if (script.answer && answeredAt) {
      await recordAudit(
        trx,
        { actorUserId: answererId, organisationId: reporter.organisation_id, action: "problem.answered", entity: "problem", entityId: id, details: { length: script.answer.text.length } },
        answeredAt,
      );
    }
    ids.push(id);
  }
  return ids;
}
