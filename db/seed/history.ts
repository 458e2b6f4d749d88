import type { Transaction } from "kysely";
import type { Database } from "@/db/schema";
import { type ContractTermsInForce, contractTermsFor } from "@/lib/contracts/service";
import type { CycleEvent } from "@/lib/cycles/lifecycle";
import { applyCycleEvent, openCycle, refreshOrderStatus, type Station } from "@/lib/cycles/store";
import { serverEnv } from "@/lib/env";
import { mulberry32, shuffle } from "@/lib/routing/random";
import { parseOpeningHours, weeklyHours } from "@/lib/sites/opening-hours";
import { addServiceTime, isOpen, nextOpening, planReturn, promisedReturn, type ServiceCalendar, serviceMinutesBetween } from "@/lib/turnaround";
import { DAY_MS, localDayOf, MINUTE_MS, offsetMs, wallClockInstant, weekdayOf } from "@/lib/turnaround/local-time";
import { UK_BANK_HOLIDAYS_2026_2027 } from "./contracts";
import type { SeedResult } from "./demo";

// The demo's ordering history: 90 days of pickups up to `now` for every customer site, at the
// rhythm of its kind of work, every set moved through its cycle only by openCycle and
// applyCycleEvent, so the scan events, the cycles' times and the orders' statuses agree.
//
// Decisions:
// - Mail: applyCycleEvent refreshes the order's status, which queues the clinic's notification
//   e-mails. This history happened before the demo starts, so the seed deletes every outbox row
//   its replay queued, in the same transaction: seeding leaves no mail to send.
// - A set is booked again only once its previous cycle is delivered or cancelled.
// - Orders still open at `now` never take the first third (at least eight) of a site's sets by
//   serial, so a demo and a test can book those straight away.
// - No audit entries: the audit log records changes people make in Steamlane; the history is the
//   demo's backdrop, and its scan events already say who did what when.
// - The unit works its depot's opening hours and closes on bank holidays; vans leave the unit at
//   07:00, 11:00 and 15:00 (express sets go at once when the clinic is open to receive them).
// - Each order is replayed up to `now`; steps planned after `now` are not recorded. On top of
//   the regular pattern, a dozen orders are laid out backwards from `now` so that every state of
//   the flow (on the van, received … dispatched, on hold, back to washing) is present whatever
//   time the demo is seeded at.
// - Late: five orders (over four customers) are delivered — or, where the contract stops the
//   clock at release, released — after their promised time, with the cause recorded on the
//   event that delayed them. Every other order is planned to meet its promise.
// - Recalls are not part of this history: a recall belongs to a failed steriliser load and its
//   load record.
// Deterministic: every order draws from its own generator seeded by its site, day and number,
// and all times derive from `now`.

export interface HistorySeed {
  /** Order ids by reference. */
  orders: Record<string, number>;
  /** References of the orders delivered (or released) after their promised time. */
  lateOrders: string[];
}

type Stage = "collect" | "receive" | "wash_passed" | "pack" | "sterilise" | "release" | "dispatch" | "deliver";
const STAGES: readonly Stage[] = ["collect", "receive", "wash_passed", "pack", "sterilise", "release", "dispatch", "deliver"];
const stageIndex = (stage: Stage) => STAGES.indexOf(stage);

/** Seconds between two sets of one order at a stage (scanning one after the other). */
const SET_SPACING_S: Record<Stage, number> = {
  collect: 25,
  receive: 15,
  wash_passed: 0, // one washer batch
  pack: 120,
  sterilise: 0, // one steriliser load
  release: 0,
  dispatch: 10,
  deliver: 20,
};

const VAN_DEPARTURES = [7 * 60, 11 * 60, 15 * 60];
const HISTORY_DAYS = 90;
/** The share of a site's sets (and at least how many) kept free of orders open at `now`. */
const SHELF_SHARE = 1 / 3;
const SHELF_MINIMUM = 8;

interface PickupPattern {
  /** Chance of a pickup on each weekday, Sunday first (as weekdayOf counts). */
  days: readonly [number, number, number, number, number, number, number];
  /** The collection window, local minutes after midnight. */
  window: readonly [number, number];
  sets: readonly [number, number];
  expressShare: number;
}

const h = (hours: number, minutes = 0) => hours * 60 + minutes;

/** How often each demo site sends sets, by site name; others use DEFAULT_PATTERN. */
const PATTERNS: Record<string, PickupPattern> = {
  // The hospital's theatres: every day, a lighter list on Sundays.
  "Quillby Moor General – Main Theatres": { days: [0.4, 1, 1, 1, 1, 1, 1], window: [h(16), h(18)], sets: [2, 7], expressShare: 0.08 },
  "Quillby Moor General – Day Case Unit": { days: [0, 0.8, 0.8, 0.8, 0.8, 0.8, 0], window: [h(15), h(17)], sets: [2, 6], expressShare: 0.05 },
  "Quillby Moor Eye Centre": { days: [0, 0, 0.9, 0, 0.9, 0, 0], window: [h(14), h(16)], sets: [1, 5], expressShare: 0 },
  "Otterwick Day Surgery Centre": { days: [0, 0.8, 0.8, 0.8, 0.8, 0.8, 0], window: [h(15, 30), h(17, 30)], sets: [2, 7], expressShare: 0.05 },
  "Hesketh Fold Treatment Rooms": { days: [0, 0, 0.9, 0, 0.3, 0, 0], window: [h(13), h(15)], sets: [1, 4], expressShare: 0 },
  // Dental practices: two or three collections a week.
  "Tanner Row Dental": { days: [0, 1, 0, 0.5, 0, 1, 0], window: [h(14), h(16)], sets: [2, 6], expressShare: 0.03 },
  "Millbeck Dental": { days: [0, 0, 1, 0, 1, 0.4, 0], window: [h(14), h(16)], sets: [2, 6], expressShare: 0.03 },
  "Cowl Street Dental": { days: [0, 0.5, 0, 1, 0, 1, 0], window: [h(14), h(16)], sets: [1, 6], expressShare: 0.03 },
  // The veterinary clinic: once a week.
  "Pellowfield Veterinary Clinic": { days: [0, 0, 0, 0, 1, 0, 0], window: [h(10), h(12)], sets: [2, 6], expressShare: 0 },
};
const DEFAULT_PATTERN: PickupPattern = { days: [0, 0, 0.8, 0, 0.8, 0, 0], window: [h(10), h(12)], sets: [1, 4], expressShare: 0 };

const NOTES = [
  "Two trays from the emergency list; please prioritise if you can.",
  "Please ring the store on arrival.",
  "One tray is missing its lid clip; the clip is in the bag with the tray.",
  "Sets from the afternoon list; the evening list follows tomorrow.",
  "Collect from the side door, please.",
];
const HEAVY_SOIL_NOTE = "Long orthopaedic list: trays were not pre-rinsed.";
const CANCEL_REASONS = ["List cancelled; the sets were not used.", "Booked twice by mistake.", "Sets kept on site for tomorrow's list."];
const QUICK_HOLDS = [
  "Tray list did not match the contents; checked against the catalogue and corrected.",
  "Instrument tip looked chipped; checked by the quality lead and found fit for use.",
];
const REWASH_REASON = "Residue in a box joint found at inspection; washed again.";

/** The orders laid out backwards from `now`: the state at `now`, and what happened to one set. */
interface Showcase {
  state: Stage;
  site: string;
  /** One set (or, for a failed batch, all) taken off the main line just before `now`. */
  incident?: { kind: "hold"; reason: string } | { kind: "failed_batch"; reason: string } | { kind: "rewash"; reason: string };
}
const THEATRES = "Quillby Moor General – Main Theatres";
const SHOWCASES: Showcase[] = [
  { state: "collect", site: THEATRES },
  { state: "receive", site: "Quillby Moor General – Day Case Unit" },
  { state: "wash_passed", site: THEATRES },
  { state: "pack", site: "Otterwick Day Surgery Centre" },
  { state: "sterilise", site: THEATRES },
  { state: "release", site: "Tanner Row Dental" },
  { state: "dispatch", site: "Quillby Moor General – Day Case Unit" },
  { state: "pack", site: THEATRES, incident: { kind: "hold", reason: "Instrument count one short (needle holder); waiting for the clinic to confirm." } },
  { state: "wash_passed", site: "Otterwick Day Surgery Centre", incident: { kind: "hold", reason: "Stiff hinge on a pair of scissors; waiting for a replacement instrument." } },
  { state: "receive", site: "Quillby Moor Eye Centre", incident: { kind: "hold", reason: "Set arrived without its tray list; waiting for the clinic to send it." } },
  { state: "receive", site: THEATRES, incident: { kind: "failed_batch", reason: "Washer stopped on a low-temperature alarm; the batch is washed again." } },
  { state: "wash_passed", site: "Quillby Moor General – Day Case Unit", incident: { kind: "rewash", reason: "Residue in a box joint found at inspection; sent back to washing." } },
];

type LateCause = "hold_missing" | "steriliser_fault" | "rewash_then_hold";
/** The late orders: customer, how many days before `now` (at least), and the cause. */
const LATE_PLAN: { organisation: string; daysAgo: number; cause: LateCause }[] = [
  { organisation: "QMH", daysAgo: 70, cause: "hold_missing" },
  { organisation: "MDP", daysAgo: 52, cause: "steriliser_fault" },
  { organisation: "ODS", daysAgo: 38, cause: "rewash_then_hold" },
  { organisation: "QMH", daysAgo: 21, cause: "steriliser_fault" },
  { organisation: "PVC", daysAgo: 30, cause: "hold_missing" },
];

interface Step {
  event: CycleEvent;
  at: number;
  station: Station;
  userId: number | null;
  details?: Record<string, unknown>;
}

interface SetInfo {
  id: number;
  serial: string;
  setClass: string;
  loaner: boolean;
  /** When its last cycle ended (ms); Infinity while one is open. */
  freeAt: number;
}

interface SiteInfo {
  id: number;
  organisationId: number;
  shortCode: string;
  name: string;
  calendar: ServiceCalendar;
  pattern: PickupPattern;
  bookerId: number | null;
  sets: SetInfo[];
  reserved: Set<number>;
}

interface PlannedOrder {
  site: SiteInfo;
  rand: () => number;
  createdAt: number;
  from: number;
  until: number;
  serviceLevel: "standard" | "express";
  heavySoil: boolean;
  outOfHours: boolean;
  neededBackBy: number;
  promisedAt: number;
  contract: ContractTermsInForce;
  setCount: number;
  /** One path of steps per set (index 0 is the set incidents happen to). */
  paths: Step[][];
  cancel?: { at: number; reason: string };
  notes: string | null;
  regular: boolean;
  late?: LateCause;
}

// FNV-1a: a stable 32-bit seed per text.
function seedOf(text: string): number {
  let hash = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    hash ^= text.charCodeAt(i);
    hash = Math.imul(hash, 0x01000193) >>> 0;
  }
  return hash;
}

const between = (rand: () => number, low: number, high: number) => low + rand() * (high - low);
const wholeSecond = (ms: number) => Math.round(ms / 1000) * 1000;

class HistoryPlanner {
  readonly unit: ServiceCalendar;
  private readonly nowMs: number;
  private readonly today: number;
  private readonly holidays: Set<number>;
  private readonly contracts = new Map<string, ContractTermsInForce | null>();

  constructor(
    private readonly trx: Transaction<Database>,
    private readonly timeZone: string,
    unitHours: ServiceCalendar["hours"],
    private readonly staff: { drivers: (number | null)[]; technicians: (number | null)[]; quality: number | null },
    now: Date,
  ) {
    const holidays = [...UK_BANK_HOLIDAYS_2026_2027];
    this.unit = { timeZone, hours: unitHours, holidays };
    this.holidays = new Set(holidays.map((d) => Math.floor(Date.parse(`${d}T00:00:00Z`) / DAY_MS)));
    this.nowMs = now.getTime();
    this.today = localDayOf(timeZone, this.nowMs);
  }

  get now() {
    return this.nowMs;
  }

  get historyStart() {
    return wallClockInstant(this.timeZone, this.today - HISTORY_DAYS, h(7));
  }

  private readonly offsets = new Map<number, number>();

  // The zone's offset at an instant, looked up once per quarter hour (today's zones change their
  // offsets on quarter hours).
  private offset(at: number) {
    const quarter = Math.floor(at / 900_000);
    let offset = this.offsets.get(quarter);
    if (offset === undefined) this.offsets.set(quarter, (offset = offsetMs(this.timeZone, quarter * 900_000)));
    return offset;
  }

  private localDay(at: number) {
    return Math.floor((at + this.offset(at)) / DAY_MS);
  }

  private minuteOfDay(at: number) {
    return Math.floor(((at + this.offset(at)) % DAY_MS) / MINUTE_MS);
  }

  async contractFor(site: SiteInfo, at: number): Promise<ContractTermsInForce | null> {
    const key = `${site.organisationId}:${localDayOf(this.timeZone, at)}`;
    if (!this.contracts.has(key)) this.contracts.set(key, await contractTermsFor(this.trx, site.organisationId, new Date(at), this.timeZone));
    return this.contracts.get(key)!;
  }

  // Who records an event where: drivers take turns by day, the early technician until 14:00.
  step(event: CycleEvent, at: number, details?: Record<string, unknown>): Step {
    const day = this.localDay(at);
    const driver = this.staff.drivers[day % this.staff.drivers.length] ?? null;
    const technician = this.staff.technicians[this.minuteOfDay(at) < h(14) ? 0 : 1] ?? this.staff.technicians[0] ?? null;
    const where: Record<string, [Station, number | null]> = {
      collect: ["van", driver],
      receive: ["receiving", technician],
      wash_passed: ["washing", technician],
      wash_failed: ["washing", technician],
      send_to_rewash: ["packing", technician],
      pack: ["packing", technician],
      sterilise: ["sterilising", technician],
      release: ["release", this.staff.quality],
      hold: ["quality", this.staff.quality],
      resume: ["quality", this.staff.quality],
      dispatch: ["dispatch", driver],
      deliver: ["van", driver],
    };
    const [station, userId] = where[event]!;
    return { event, at: wholeSecond(at), station, userId, ...(details ? { details } : {}) };
  }

  /** The latest instant from which `minutes` of the unit's working time run until `end`. */
  serviceTimeBefore(end: number, minutes: number): number {
    let low = end - minutes * MINUTE_MS - 14 * DAY_MS;
    let high = end;
    const endDate = new Date(end);
    while (high - low > 1000) {
      const mid = Math.floor((low + high) / 2);
      if (serviceMinutesBetween(this.unit, new Date(mid), endDate) >= minutes) low = mid;
      else high = mid;
    }
    return low;
  }

  private after(at: number, minutes: number) {
    return addServiceTime(this.unit, new Date(at), minutes).getTime();
  }

  /** The van that takes released sets back: the first departure whose arrival finds the site open. */
  private van(site: SiteInfo, released: number, fast: boolean, rand: () => number, arriveAfter = 0): { dispatch: number; deliver: number } {
    if (fast) {
      // A van of its own straight away, or else one that reaches the site as it opens.
      const dispatch = this.after(released, between(rand, 10, 15));
      const deliver = dispatch + between(rand, 20, 40) * MINUTE_MS;
      if (deliver > arriveAfter && isOpen(site.calendar, new Date(deliver))) return { dispatch, deliver };
      const opening = nextOpening(site.calendar, new Date(Math.max(released + 40 * MINUTE_MS, arriveAfter + 1000))).getTime();
      const early = opening - between(rand, 25, 35) * MINUTE_MS;
      if (isOpen(this.unit, new Date(early))) return { dispatch: early, deliver: opening + between(rand, 1, 5) * MINUTE_MS };
    }
    const firstDay = localDayOf(this.timeZone, released);
    for (let day = firstDay; day < firstDay + 14; day++) {
      for (const minute of VAN_DEPARTURES) {
        const dispatch = wallClockInstant(this.timeZone, day, minute) + Math.floor(rand() * 5) * MINUTE_MS;
        if (dispatch < released + 10 * MINUTE_MS || !isOpen(this.unit, new Date(dispatch))) continue;
        const deliver = dispatch + between(rand, 25, 70) * MINUTE_MS;
        if (deliver > arriveAfter && isOpen(site.calendar, new Date(deliver))) return { dispatch, deliver };
      }
    }
    const dispatch = this.after(Math.max(released, arriveAfter), 15);
    return { dispatch, deliver: nextOpening(site.calendar, new Date(dispatch + 30 * MINUTE_MS)).getTime() };
  }

  /** Stage times of sets moving together from `from` (reached at `at`) to delivery. */
  forward(order: PlannedOrder, from: Stage, at: number, fast: boolean, options: { arriveAfter?: number } = {}): Map<Stage, number> {
    const { rand, site } = order;
    const times = new Map<Stage, number>([[from, at]]);
    const packSpread = (order.setCount - 1) * SET_SPACING_S.pack * 1000;
    let previous = at;
    for (const stage of STAGES.slice(stageIndex(from) + 1)) {
      let next: number;
      switch (stage) {
        case "collect":
          throw new Error("a cycle is collected only from its window");
        case "receive":
          next = nextOpening(this.unit, new Date(previous + between(rand, 35, 60) * MINUTE_MS)).getTime();
          break;
        case "wash_passed":
          next = this.after(previous, fast ? between(rand, 40, 70) : between(rand, 60, 180));
          break;
        case "pack":
          next = this.after(previous, fast ? between(rand, 20, 35) : between(rand, 30, 90));
          break;
        case "sterilise":
          // One load, after the last set of the group is packed.
          next = this.after(this.after(previous, packSpread / MINUTE_MS), fast ? between(rand, 55, 70) : between(rand, 60, 100));
          break;
        case "release":
          next = this.after(previous, fast ? between(rand, 10, 20) : between(rand, 10, 45));
          break;
        case "dispatch": {
          const van = this.van(site, previous, fast, rand, options.arriveAfter);
          times.set("dispatch", van.dispatch);
          times.set("deliver", van.deliver);
          return times;
        }
        case "deliver":
          throw new Error("delivery is planned with its van");
      }
      times.set(stage, next);
      previous = next;
    }
    return times;
  }

  /** Gap in working minutes before a stage, when laying an order out backwards. */
  private gapBefore(stage: Stage, rand: () => number): number {
    switch (stage) {
      case "wash_passed":
        return between(rand, 60, 180);
      case "pack":
        return between(rand, 30, 90);
      case "sterilise":
        return between(rand, 60, 100);
      case "release":
        return between(rand, 10, 45);
      case "dispatch":
        return between(rand, 10, 40);
      default:
        return 0;
    }
  }

  /** Stage times up to `last`, reached at `end`, laid out backwards in the unit's working time. */
  backward(last: Stage, end: number, rand: () => number): Map<Stage, number> {
    const times = new Map<Stage, number>([[last, end]]);
    let next = end;
    for (let i = stageIndex(last) - 1; i >= 1; i--) {
      next = this.serviceTimeBefore(next, this.gapBefore(STAGES[i + 1]!, rand));
      times.set(STAGES[i]!, next);
    }
    if (stageIndex(last) >= 1) times.set("collect", times.get("receive")! - between(rand, 35, 60) * MINUTE_MS);
    return times;
  }

  /**
   * Per-set steps from stage times; `anchor` is the set that is exactly on the stage time, the
   * others scanned before or after it (inside the unit's working time for the unit's stations).
   */
  expand(times: Map<Stage, number>, setIndex: number, anchor: number, until?: Stage): Step[] {
    const steps: Step[] = [];
    for (const stage of STAGES) {
      const at = times.get(stage);
      if (at === undefined) continue;
      const offset = (setIndex - anchor) * SET_SPACING_S[stage] * 1000;
      let when = at + offset;
      if (offset !== 0 && stage !== "collect" && stage !== "deliver") {
        when = offset > 0 ? this.after(at, offset / MINUTE_MS) : this.serviceTimeBefore(at, -offset / MINUTE_MS);
      }
      steps.push(this.step(stage, when));
      if (stage === until) break;
    }
    return steps;
  }

  /** The path of a set taken off the line after `stage` by a hold, resumed `holdMinutes` later. */
  private holdPath(order: PlannedOrder, group: Map<Stage, number>, stage: Stage, reason: string, holdMinutes: (heldAt: number) => number, note?: string): Step[] {
    const steps = this.expand(group, 0, 0, stage);
    const heldAt = this.after(steps.at(-1)!.at, between(order.rand, 10, 30));
    const resumedAt = this.after(heldAt, holdMinutes(heldAt));
    steps.push(this.step("hold", heldAt, { reason }), this.step("resume", resumedAt, note ? { note } : undefined));
    const rest = this.forward(order, stage, resumedAt, false);
    rest.delete(stage);
    return [...steps, ...this.expand(rest, 0, 0)];
  }

  /** The path of a set sent back to washing at inspection, washed again, then on its way. */
  private rewashPath(order: PlannedOrder, group: Map<Stage, number>): { steps: Step[]; washedAgain: number } {
    const steps = this.expand(group, 0, 0, "wash_passed");
    const sentBack = this.after(steps.at(-1)!.at, between(order.rand, 20, 40));
    const washedAgain = this.after(sentBack, between(order.rand, 60, 120));
    steps.push(this.step("send_to_rewash", sentBack, { reason: REWASH_REASON }), this.step("wash_passed", washedAgain));
    return { steps, washedAgain };
  }

  /** A regular order's paths: collected in its window, then forward, with an occasional incident. */
  planForward(order: PlannedOrder, options: { fast: boolean; incidents: boolean }) {
    const { rand } = order;
    const fast = options.fast || order.serviceLevel === "express";
    const spacing = (order.setCount - 1) * SET_SPACING_S.collect * 1000;
    const collected = order.from + between(rand, 0.1, 0.85) * Math.max(0, order.until - order.from - spacing);
    const group = this.forward(order, "collect", collected, fast);
    order.paths = Array.from({ length: order.setCount }, (_, i) => this.expand(group, i, 0));
    if (!options.incidents || fast) return;
    const roll = rand();
    if (roll < 0.025) {
      order.paths[0] = this.holdPath(order, group, rand() < 0.5 ? "wash_passed" : "pack", QUICK_HOLDS[Math.floor(rand() * QUICK_HOLDS.length)]!, () => between(rand, 30, 90));
    } else if (roll < 0.05) {
      const { steps, washedAgain } = this.rewashPath(order, group);
      const rest = this.forward(order, "wash_passed", washedAgain, false);
      rest.delete("wash_passed");
      order.paths[0] = [...steps, ...this.expand(rest, 0, 0)];
    }
  }

  /** Replans an order so that it ends after its promise, by the given cause. */
  planLate(order: PlannedOrder, cause: LateCause) {
    const { rand } = order;
    const promised = order.promisedAt;
    const untilPromise = (at: number) => serviceMinutesBetween(this.unit, new Date(at), new Date(promised)) + between(rand, 60, 240);
    const collected = order.from + between(rand, 0.1, 0.85) * Math.max(0, order.until - order.from - order.setCount * 25_000);
    const group = this.forward(order, "collect", collected, false);
    order.paths = Array.from({ length: order.setCount }, (_, i) => this.expand(group, i, 0));
    if (cause === "hold_missing") {
      order.paths[0] = this.holdPath(
        order,
        group,
        "pack",
        "Instrument count one short (bone curette); waiting for the clinic to find it.",
        untilPromise,
        "The clinic returned the curette the next day; the set was completed.",
      );
    } else if (cause === "rewash_then_hold") {
      const { steps, washedAgain } = this.rewashPath(order, group);
      const rewashed = new Map(group);
      rewashed.set("wash_passed", washedAgain);
      const held = this.holdPath(order, rewashed, "wash_passed", "Washer record of the rewash incomplete; waiting for the quality lead to confirm the cycle.", untilPromise);
      order.paths[0] = [...steps, ...held.slice(held.findIndex((s) => s.event === "hold"))];
    } else {
      // The steriliser load waited for a repair and its release for the machine's check.
      const packed = this.after(group.get("pack")!, ((order.setCount - 1) * SET_SPACING_S.pack) / 60);
      const loaded = this.after(packed, Math.max(30, serviceMinutesBetween(this.unit, new Date(packed), new Date(promised)) - between(rand, 20, 40)));
      const released = this.after(Math.max(loaded, promised), between(rand, 30, 90));
      const van = this.van(order.site, released, false, rand, promised);
      const times = new Map(group);
      times.set("sterilise", loaded);
      times.set("release", released);
      times.set("dispatch", van.dispatch);
      times.set("deliver", van.deliver);
      order.paths = Array.from({ length: order.setCount }, (_, i) => {
        const steps = this.expand(times, i, 0);
        const load = steps.find((s) => s.event === "sterilise")!;
        load.details = { note: "Load started late: the steriliser was out of service for a door-seal repair." };
        return steps;
      });
    }
    order.late = cause;
  }

  /** When the turnaround clock stopped for a path (release or delivery, as the contract says). */
  stoppedAt(order: PlannedOrder, path: Step[]): number | null {
    const event = order.contract.clockStopsAt === "released" ? "release" : "deliver";
    return path.findLast((s) => s.event === event)?.at ?? null;
  }

  /**
   * Late against the promise made at booking, or against the turnaround clock started by the
   * set's actual receipt (which can run out earlier when the set arrived early).
   */
  isLate(order: PlannedOrder): boolean {
    const hours = order.contract.turnaroundHours[order.serviceLevel];
    return order.paths.some((path) => {
      const stopped = this.stoppedAt(order, path);
      const received = path.find((s) => s.event === "receive")?.at;
      if (stopped === null || received === undefined) return false;
      const due = promisedReturn({ calendar: order.contract.serviceCalendar, receivedAt: new Date(received), turnaroundHours: hours }).getTime();
      return stopped > Math.min(order.promisedAt, due);
    });
  }

  /** A collection window of the site's opening hours around `collected`, or null. */
  windowAround(site: SiteInfo, collected: number): { from: number; until: number } | null {
    const quarter = 15 * MINUTE_MS;
    const base = Math.floor(collected / quarter) * quarter;
    for (const [before, after] of [
      [30, 90],
      [90, 30],
      [15, 45],
      [5, 25],
    ] as const) {
      const from = base - before * MINUTE_MS;
      const until = base + after * MINUTE_MS;
      const open = serviceMinutesBetween(site.calendar, new Date(from), new Date(until));
      if (open + 0.01 >= (until - from) / MINUTE_MS && from <= collected && collected <= until) return { from, until };
    }
    return null;
  }

  /** A pickup's promise and terms as bookPickup computes them at `createdAt`. */
  async terms(site: SiteInfo, createdAt: number, from: number, until: number, serviceLevel: "standard" | "express", rand: () => number) {
    const contract = await this.contractFor(site, createdAt);
    if (!contract) return null;
    if (!contract.rateCard.classes.length) return null;
    const windowMinutes = (until - from) / MINUTE_MS;
    const outOfHours = serviceMinutesBetween(contract.serviceCalendar, new Date(from), new Date(until)) + 0.01 < windowMinutes;
    const probe = planReturn({
      calendar: contract.serviceCalendar,
      collectionWindowEnd: new Date(until),
      turnaroundHours: contract.turnaroundHours,
      neededBackBy: new Date(until + 365 * DAY_MS),
      serviceLevel,
    });
    const promisedAt = probe.promisedAt.getTime();
    // The clinic needs them for a list some hours after the promise, on the hour.
    const hour = 60 * MINUTE_MS;
    const extraHours = serviceLevel === "express" ? 1 + Math.floor(rand() * 3) : 2 + Math.floor(rand() * 18);
    const neededBackBy = Math.ceil(promisedAt / hour) * hour + extraHours * hour;
    const plan = planReturn({
      calendar: contract.serviceCalendar,
      collectionWindowEnd: new Date(until),
      turnaroundHours: contract.turnaroundHours,
      neededBackBy: new Date(neededBackBy),
      serviceLevel,
    });
    if (!plan.meetsNeededBy) return null;
    return { contract, outOfHours, promisedAt: plan.promisedAt.getTime(), neededBackBy };
  }

  /** When a pickup was booked: one to three days before its window, in office hours. */
  bookedAt(from: number, rand: () => number): number {
    const daysBefore = 1 + (rand() < 0.3 ? 1 : 0) + (rand() < 0.1 ? 1 : 0);
    const day = localDayOf(this.timeZone, from) - daysBefore;
    const at = wallClockInstant(this.timeZone, day, h(8)) + Math.floor(rand() * 8 * 60) * MINUTE_MS + Math.floor(rand() * 60) * 1000;
    return Math.max(this.historyStart, Math.min(at, from - 30 * MINUTE_MS, this.nowMs - 5 * MINUTE_MS));
  }

  isHoliday(day: number) {
    return this.holidays.has(day);
  }

  get todayNumber() {
    return this.today;
  }
}

const calendarIsAllDay = (calendar: ServiceCalendar) =>
  Object.values(calendar.hours).every((day) => day.length === 1 && day[0]!.start === "00:00" && day[0]!.end === "24:00");

/** Seeds the history into the demo's transaction; call after the sets and contracts exist. */
export async function seedHistory(trx: Transaction<Database>, seed: SeedResult, now: Date): Promise<HistorySeed> {
  const timeZone = serverEnv().UNIT_TIME_ZONE;
  const outboxBefore = await trx.selectFrom("outbox").select((eb) => eb.fn.max("id").as("id")).executeTakeFirst();
  const user = (email: string) => seed.users[email] ?? null;
  const depot = await trx.selectFrom("sites").select("opening_hours").where("is_depot", "=", 1).orderBy("id").executeTakeFirst();
  const unitHours = depot ? parseOpeningHours(depot.opening_hours) : weeklyHours(["mon", "tue", "wed", "thu", "fri", "sat"], "06:00", "22:00");
  const planner = new HistoryPlanner(
    trx,
    timeZone,
    unitHours,
    {
      drivers: [user("driver@larkmoor.example"), user("driver2@larkmoor.example")],
      technicians: [user("tech@larkmoor.example"), user("tech2@larkmoor.example")],
      quality: user("quality@larkmoor.example"),
    },
    now,
  );

  const sites = await loadSites(trx, timeZone);
  const bySiteName = new Map(sites.map((s) => [s.name, s]));
  const planned: PlannedOrder[] = [];

  // The regular rhythm, day by day, from 90 days ago to tomorrow.
  for (let day = planner.todayNumber - HISTORY_DAYS; day <= planner.todayNumber + 1; day++) {
    for (const site of sites) {
      const rand = mulberry32(seedOf(`${site.name}:${day}`));
      const { pattern } = site;
      if (rand() >= pattern.days[weekdayOf(day)]!) continue;
      if (planner.isHoliday(day) && !calendarIsAllDay(site.calendar)) continue;
      const serviceLevel = rand() < pattern.expressShare ? "express" : "standard";
      let from = wallClockInstant(timeZone, day, pattern.window[0]);
      let until = wallClockInstant(timeZone, day, pattern.window[1]);
      // Express pickups are collected in the morning, so the sets are back while the site is open.
      if (serviceLevel === "express" && !calendarIsAllDay(site.calendar)) {
        from = wallClockInstant(timeZone, day, h(9));
        until = wallClockInstant(timeZone, day, h(10, 30));
      }
      if (from < planner.historyStart) continue;
      if (serviceMinutesBetween(site.calendar, new Date(from), new Date(until)) + 0.01 < (until - from) / MINUTE_MS) continue;
      const createdAt = planner.bookedAt(from, rand);
      const terms = await planner.terms(site, createdAt, from, until, serviceLevel, rand);
      if (!terms) continue;
      const heavySoil = rand() < 0.06;
      const order: PlannedOrder = {
        site,
        rand,
        createdAt,
        from,
        until,
        serviceLevel,
        heavySoil,
        ...terms,
        setCount: pattern.sets[0] + Math.floor(rand() * (pattern.sets[1] - pattern.sets[0] + 1)),
        paths: [],
        notes: heavySoil ? HEAVY_SOIL_NOTE : rand() < 0.12 ? NOTES[Math.floor(rand() * NOTES.length)]! : null,
        regular: true,
      };
      if (rand() < 0.03 && from < planner.now) {
        // Called off in the hours before the collection, or soon after booking when that is later.
        const at = wholeSecond(Math.max(from - between(rand, 1, 6) * 60 * MINUTE_MS, createdAt + (from - createdAt) / 2));
        order.cancel = { at, reason: CANCEL_REASONS[Math.floor(rand() * CANCEL_REASONS.length)]! };
      } else {
        planner.planForward(order, { fast: false, incidents: true });
        // Every regular order is planned to keep its promise.
        if (planner.isLate(order)) planner.planForward(order, { fast: true, incidents: false });
      }
      planned.push(order);
    }
  }

  // The late ones: the first fitting order of each customer from the given day on.
  const lateCandidates = planned.filter(
    (o) => o.regular && !o.cancel && o.serviceLevel === "standard" && o.paths.every((p) => p.at(-1)!.event === "deliver" && p.at(-1)!.at < planner.now - 2 * DAY_MS),
  );
  for (const late of LATE_PLAN) {
    const notBefore = wallClockInstant(timeZone, planner.todayNumber - late.daysAgo, 0);
    for (const order of lateCandidates.filter((o) => o.site.shortCode === late.organisation && o.from >= notBefore && !o.late)) {
      planner.planLate(order, late.cause);
      if (planner.isLate(order) && order.paths.every((p) => p.at(-1)!.at < planner.now)) break;
      // It would still be on its way today: keep it on time and try the customer's next order.
      delete order.late;
      planner.planForward(order, { fast: false, incidents: false });
      if (planner.isLate(order)) planner.planForward(order, { fast: true, incidents: false });
    }
  }

  // The orders laid out backwards from `now`, so that every state is present.
  for (const [index, showcase] of SHOWCASES.entries()) {
    const order = await planShowcase(planner, showcase, index, bySiteName);
    if (order) planned.push(order);
  }

  // Write in booking order, choosing each order's sets among those back on the shelf.
  planned.sort((a, b) => a.createdAt - b.createdAt || a.site.id - b.site.id);
  const nextNumber = await firstReferenceNumbers(trx, sites);
  const history: HistorySeed = { orders: {}, lateOrders: [] };
  for (const order of planned) {
    const written = await writeOrder(trx, planner, order, nextNumber);
    if (!written) continue;
    history.orders[written.reference] = written.id;
    if (order.late) history.lateOrders.push(written.reference);
  }

  // The notifications the replay queued describe the past: nothing is left to send.
  await trx
    .deleteFrom("outbox")
    .where("id", ">", Number(outboxBefore?.id ?? 0))
    .execute();
  return history;
}

async function loadSites(trx: Transaction<Database>, timeZone: string): Promise<SiteInfo[]> {
  const rows = await trx
    .selectFrom("sites")
    .innerJoin("organisations", "organisations.id", "sites.organisation_id")
    .select(["sites.id", "sites.organisation_id", "sites.name", "sites.opening_hours", "organisations.short_code"])
    .where("organisations.kind", "=", "customer")
    .where("organisations.active", "=", 1)
    .where("sites.active", "=", 1)
    .where("sites.is_depot", "=", 0)
    .orderBy("sites.id")
    .execute();
  const sets = await trx
    .selectFrom("sets")
    .innerJoin("set_types", "set_types.id", "sets.set_type_id")
    .select(["sets.id", "sets.serial", "sets.home_site_id", "set_types.set_class", "set_types.ifu_file_id"])
    .where("sets.status", "=", "in_service")
    .orderBy("sets.serial")
    .execute();
  const bookers = await trx
    .selectFrom("users")
    .select(["id", "organisation_id", "site_id", "role"])
    .where("status", "=", "active")
    .where("role", "in", ["clinic_staff", "clinic_manager"])
    .orderBy("id")
    .execute();
  return rows.map((row) => {
    const own = sets.filter((s) => s.home_site_id === row.id);
    // A loaner set is booked only with its instructions for use on file, as bookings require.
    const usable = own.filter((s) => s.set_class !== "loaner_set" || s.ifu_file_id !== null);
    const shelf = (list: typeof own) => list.slice(0, Math.max(SHELF_MINIMUM, Math.ceil(list.length * SHELF_SHARE))).map((s) => s.id);
    const reserved = new Set([...shelf(own), ...shelf(own.filter((s) => s.set_class !== "loaner_set"))]);
    const booker =
      bookers.find((u) => u.role === "clinic_staff" && u.site_id === row.id) ??
      bookers.find((u) => u.role === "clinic_manager" && u.organisation_id === row.organisation_id);
    return {
      id: row.id,
      organisationId: row.organisation_id,
      shortCode: row.short_code,
      name: row.name,
      calendar: { timeZone, hours: parseOpeningHours(row.opening_hours), holidays: [] },
      pattern: PATTERNS[row.name] ?? DEFAULT_PATTERN,
      bookerId: booker?.id ?? null,
      sets: usable.map((s) => ({ id: s.id, serial: s.serial, setClass: s.set_class, loaner: s.set_class === "loaner_set", freeAt: 0 })),
      reserved,
    };
  });
}

/** One showcase order: its last step shortly before `now`, everything before it laid out backwards. */
async function planShowcase(planner: HistoryPlanner, showcase: Showcase, index: number, sites: Map<string, SiteInfo>): Promise<PlannedOrder | null> {
  const rand = mulberry32(seedOf(`showcase:${index}:${planner.now}`));
  const incident = showcase.incident;
  const end =
    showcase.state === "collect"
      ? planner.now - between(rand, 15, 40) * MINUTE_MS
      : planner.serviceTimeBefore(planner.now, incident ? between(rand, 40, 120) : between(rand, 5, 60));
  const times = planner.backward(showcase.state, end, rand);
  const collected = times.get("collect")!;
  let site = sites.get(showcase.site);
  let window = site && isOpen(site.calendar, new Date(collected)) ? planner.windowAround(site, collected) : null;
  if (!window) {
    site = sites.get(THEATRES);
    window = site ? planner.windowAround(site, collected) : null;
  }
  if (!site || !window) return null;
  // A failed washer batch sends all of its sets back; that order has one large tray.
  const setCount = incident?.kind === "failed_batch" ? 1 : 2 + Math.floor(rand() * 4);
  const createdAt = planner.bookedAt(window.from, rand);
  if (createdAt > collected) return null;
  const terms = await planner.terms(site, createdAt, window.from, window.until, "standard", rand);
  if (!terms) return null;
  const order: PlannedOrder = {
    site,
    rand,
    createdAt,
    ...window,
    serviceLevel: "standard",
    heavySoil: false,
    ...terms,
    setCount,
    paths: [],
    notes: null,
    regular: false,
  };
  // The last set of the group reaches the stage at `end`; the others a little before.
  order.paths = Array.from({ length: setCount }, (_, i) => planner.expand(times, i, setCount - 1));
  if (incident) {
    const after = (at: number) => {
      const next = addServiceTime(planner.unit, new Date(at), between(rand, 10, 30)).getTime();
      return wholeSecond(next < planner.now ? next : at + (planner.now - at) / 2);
    };
    const extra = (path: Step[], event: CycleEvent, reason: string) => path.push(planner.step(event, after(path.at(-1)!.at), { reason }));
    if (incident.kind === "failed_batch") {
      for (const path of order.paths) extra(path, "wash_failed", incident.reason);
    } else {
      extra(order.paths[0]!, incident.kind === "hold" ? "hold" : "send_to_rewash", incident.reason);
    }
  }
  return order;
}

async function firstReferenceNumbers(trx: Transaction<Database>, sites: SiteInfo[]): Promise<Map<number, { prefix: string; next: number }>> {
  const numbers = new Map<number, { prefix: string; next: number }>();
  for (const site of sites) {
    if (numbers.has(site.organisationId)) continue;
    const prefix = `${site.shortCode}-P`;
    const last = await trx
      .selectFrom("orders")
      .select("reference")
      .where("organisation_id", "=", site.organisationId)
      .where("reference", "like", `${prefix}%`)
      .orderBy("reference", "desc")
      .limit(1)
      .executeTakeFirst();
    numbers.set(site.organisationId, { prefix, next: last ? Number(last.reference.slice(prefix.length)) + 1 : 1 });
  }
  return numbers;
}

/** Books one planned order on the sets back on the shelf, and replays its steps up to `now`. */
async function writeOrder(
  trx: Transaction<Database>,
  planner: HistoryPlanner,
  order: PlannedOrder,
  numbers: Map<number, { prefix: string; next: number }>,
): Promise<{ id: number; reference: string } | null> {
  const { site, rand, createdAt } = order;
  const now = planner.now;
  const closedBy = order.cancel ? order.cancel.at : Math.max(...order.paths.map((p) => (p.at(-1)?.event === "deliver" ? p.at(-1)!.at : Infinity)));
  const openAtNow = closedBy > now;
  const priced = new Set(order.contract.rateCard.classes.map((c) => c.setClass));
  const free = site.sets.filter((s) => s.freeAt <= createdAt && priced.has(s.setClass) && !(openAtNow && site.reserved.has(s.id)));
  const pool = shuffle(rand, free.filter((s) => !s.loaner));
  const chosen = pool.slice(0, order.setCount);
  // Now and then a loaner set travels with the order.
  const loaner = free.find((s) => s.loaner);
  if (loaner && rand() < 0.04 && chosen.length > 0) chosen[chosen.length - 1] = loaner;
  if (chosen.length === 0) return null;
  const paths = order.paths.slice(0, chosen.length);

  const number = numbers.get(site.organisationId)!;
  const reference = `${number.prefix}${String(number.next++).padStart(6, "0")}`;
  const iso = new Date(createdAt).toISOString();
  const { id: orderId } = await trx
    .insertInto("orders")
    .values({
      organisation_id: site.organisationId,
      site_id: site.id,
      reference,
      kind: "pickup",
      status: "booked",
      service_level: order.serviceLevel,
      collection_from: new Date(order.from).toISOString(),
      collection_until: new Date(order.until).toISOString(),
      needed_back_by: new Date(order.neededBackBy).toISOString(),
      promised_return_at: new Date(order.promisedAt).toISOString(),
      heavy_soil: order.heavySoil ? 1 : 0,
      out_of_hours: order.outOfHours ? 1 : 0,
      notes: order.notes,
      created_by: site.bookerId,
      created_at: iso,
      updated_at: iso,
    })
    .returning("id")
    .executeTakeFirstOrThrow();
  const cycleIds: number[] = [];
  for (const set of chosen) {
    cycleIds.push(
      await openCycle(trx, {
        organisationId: site.organisationId,
        siteId: site.id,
        setId: set.id,
        orderId,
        serviceLevel: order.serviceLevel,
        heavySoil: order.heavySoil,
        outOfHours: order.outOfHours,
        loaner: set.loaner,
        neededBackBy: new Date(order.neededBackBy).toISOString(),
        promisedAt: new Date(order.promisedAt).toISOString(),
        userId: site.bookerId,
        at: new Date(createdAt),
      }),
    );
  }

  if (order.cancel && order.cancel.at <= now) {
    const at = new Date(order.cancel.at);
    for (const cycleId of cycleIds) {
      await applyCycleEvent(trx, { cycleId, event: "cancel", station: "clinic", userId: site.bookerId, at, details: { reason: order.cancel.reason } });
    }
    await trx.updateTable("orders").set({ status: "cancelled", cancelled_at: at.toISOString(), updated_at: at.toISOString() }).where("id", "=", orderId).execute();
    await refreshOrderStatus(trx, orderId, at);
  } else {
    // Every set's steps up to now, in time order across the order's sets.
    const steps = paths
      .flatMap((path, i) => path.filter((s) => s.at <= now).map((s) => ({ ...s, cycleId: cycleIds[i]!, i })))
      .sort((a, b) => a.at - b.at || a.i - b.i);
    for (const s of steps) {
      await applyCycleEvent(trx, {
        cycleId: s.cycleId,
        event: s.event,
        station: s.station,
        userId: s.userId,
        at: new Date(s.at),
        details: s.details,
      });
    }
  }
  for (const set of chosen) set.freeAt = openAtNow ? Infinity : closedBy;
  return { id: orderId, reference };
}
