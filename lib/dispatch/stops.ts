import { type OpeningHours, WEEKDAY_LABELS, type Weekday } from "@/lib/sites/opening-hours";
import { dayNumberOf } from "@/lib/turnaround/calendar";
import { MINUTE_MS, wallClockInstant, weekdayOf } from "@/lib/turnaround/local-time";

// The day's stops for the van runs, built from the orders (pure: no I/O).
//
// Times on a plan are minutes elapsed since local midnight of the plan's day in the unit's time
// zone (so a day with a clock change still measures real driving time); clock texts such as
// opening hours are converted with the zone's rules.
//
// - A collection is a booked pickup whose collection window falls on the day; its window is the
//   collection window cut down to the site's opening hours that day (the longest piece when the
//   hours have a lunch break). It is a hard window: nobody hands over soiled sets at a closed door.
// - A delivery is a released set waiting to go back; it may be delivered while the site is open,
//   and by its needed-back-by time when that falls on the day. Its window is soft: the planner may
//   be late at a penalty, and the plan says by how much.
// - Per site, collections whose windows overlap become one visit, and the deliveries one visit;
//   both become a single stop when the two windows overlap.
// - Service time: a fixed time per stop (parking, handover) plus a time per set scanned; both
//   are our planning defaults (common practice estimates, not measured), set per call.
// - Carts: soiled and clean sets travel in separate closed carts (WFHSS transport guidance);
//   carts = sets ÷ sets per cart, rounded up, with a default that is common practice for trays.

export const DEFAULT_STOP_OPTIONS = {
  /** Minutes at every stop: parking, finding the store, the handover and signature. */
  serviceBaseMin: 5,
  /** Minutes per set scanned at the stop. */
  servicePerSetMin: 1,
  /** Sets (trays or containers) one closed transport cart holds. */
  setsPerCart: 6,
} as const;

export interface StopOptions {
  /** The plan's day, YYYY-MM-DD, in `timeZone`. */
  day: string;
  timeZone: string;
  serviceBaseMin?: number;
  servicePerSetMin?: number;
  setsPerCart?: number;
}

export interface StopSite {
  id: number;
  organisationId: number;
  name: string;
  openingHours: OpeningHours;
}

export interface StopSet {
  cycleId: number;
  setId: number;
  serial: string;
  name: string;
}

export interface CollectionInput {
  orderId: number;
  reference: string;
  siteId: number;
  /** ISO-8601 instants. */
  collectionFrom: string;
  collectionUntil: string;
  sets: StopSet[];
}

export interface DeliveryInput {
  orderId: number;
  reference: string;
  siteId: number;
  /** ISO-8601 instant, or null when the clinic gave none. */
  neededBackBy: string | null;
  set: StopSet;
}

export interface StopOrder {
  orderId: number;
  reference: string;
  role: "collect" | "deliver";
  sets: StopSet[];
}

export interface DayStop {
  /** Stable within one build: site, kind and the orders served. */
  key: string;
  siteId: number;
  organisationId: number;
  kind: "collection" | "delivery" | "both";
  windowStartMin: number;
  windowEndMin: number;
  hard: boolean;
  serviceMin: number;
  soiledCarts: number;
  cleanCarts: number;
  orders: StopOrder[];
  /** What the dispatcher should know about the window, in words. */
  notes: string[];
}

export interface UnplannableVisit {
  siteId: number;
  orderId: number;
  reference: string;
  role: "collect" | "deliver";
  reason: string;
}

export interface DayStops {
  stops: DayStop[];
  /** Orders that cannot be visited on the day, each with the reason. */
  infeasible: UnplannableVisit[];
}

interface Interval {
  start: number;
  end: number;
}

const WEEKDAY_KEYS: Weekday[] = ["sun", "mon", "tue", "wed", "thu", "fri", "sat"];

/** "HH:MM" to minutes after midnight. */
function clockToMinutes(text: string): number {
  const [h, m] = text.split(":").map(Number) as [number, number];
  return h * 60 + m;
}

/** The plan day's clock: instants to elapsed minutes since local midnight, and back. */
export function planClock(day: string, timeZone: string) {
  if (!/^\d{4}-\d{2}-\d{2}$/.test(day)) throw new Error(`The day must read YYYY-MM-DD, got "${day}".`);
  const dayNumber = dayNumberOf(day);
  const midnight = wallClockInstant(timeZone, dayNumber, 0);
  return {
    dayNumber,
    weekday: WEEKDAY_KEYS[weekdayOf(dayNumber)]!,
    midnight,
    /** Minutes after local midnight of the day, for an ISO instant (may be negative or past 1440). */
    minutesOf: (iso: string) => (new Date(iso).getTime() - midnight) / MINUTE_MS,
    /** Elapsed minutes of a wall-clock reading on the day ("08:30" → 510 on an ordinary day). */
    wallMinutes: (minuteOfDay: number) => (wallClockInstant(timeZone, dayNumber, minuteOfDay) - midnight) / MINUTE_MS,
    /** The instant of an elapsed minute of the day. */
    instantOf: (minutes: number) => new Date(midnight + Math.round(minutes * MINUTE_MS)),
  };
}

/** "08:30" for elapsed minutes of the plan day, read on the zone's wall clock. */
export function clockText(minutes: number, clock: ReturnType<typeof planClock>, timeZone: string): string {
  return new Intl.DateTimeFormat("en-GB", { hour: "2-digit", minute: "2-digit", hourCycle: "h23", timeZone }).format(clock.instantOf(minutes));
}

function dateTimeText(at: Date, timeZone: string): string {
  return new Intl.DateTimeFormat("en-GB", { day: "numeric", month: "short", hour: "2-digit", minute: "2-digit", hourCycle: "h23", timeZone }).format(at);
}

function intersect(a: Interval, b: Interval): Interval | null {
  const start = Math.max(a.start, b.start);
  const end = Math.min(a.end, b.end);
  return end > start ? { start, end } : null;
}

function longest(pieces: Interval[]): Interval | null {
  let best: Interval | null = null;
  for (const p of pieces) if (!best || p.end - p.start > best.end - best.start) best = p;
  return best;
}

/** Builds the day's stops from the booked collections and the released sets due back. */
export function buildDayStops(
  sites: readonly StopSite[],
  collections: readonly CollectionInput[],
  deliveries: readonly DeliveryInput[],
  options: StopOptions,
): DayStops {
  const base = options.serviceBaseMin ?? DEFAULT_STOP_OPTIONS.serviceBaseMin;
  const perSet = options.servicePerSetMin ?? DEFAULT_STOP_OPTIONS.servicePerSetMin;
  const perCart = options.setsPerCart ?? DEFAULT_STOP_OPTIONS.setsPerCart;
  if (!(base >= 0) || !(perSet >= 0)) throw new Error("Service times must be zero or more minutes.");
  if (!Number.isInteger(perCart) || perCart < 1) throw new Error("Sets per cart must be a whole number of at least 1.");
  const clock = planClock(options.day, options.timeZone);
  const text = (m: number) => clockText(m, clock, options.timeZone);
  const dayName = WEEKDAY_LABELS[clock.weekday];
  const siteById = new Map(sites.map((s) => [s.id, s]));
  const opening = (site: StopSite): Interval[] =>
    site.openingHours[clock.weekday].map((i) => ({ start: clock.wallMinutes(clockToMinutes(i.start)), end: clock.wallMinutes(clockToMinutes(i.end)) }));
  const hoursText = (site: StopSite) => opening(site).map((i) => `${text(i.start)}–${text(i.end)}`).join(", ");
  const infeasible: UnplannableVisit[] = [];

  interface Visit {
    window: Interval;
    orders: StopOrder[];
    notes: string[];
  }
  const collectVisits = new Map<number, Visit[]>();
  const deliverVisits = new Map<number, Visit[]>();

  for (const c of collections) {
    const site = siteById.get(c.siteId);
    const refuse = (reason: string) => infeasible.push({ siteId: c.siteId, orderId: c.orderId, reference: c.reference, role: "collect", reason });
    if (!site) {
      refuse(`Pickup ${c.reference}: its site is not among the active sites.`);
      continue;
    }
    const window = { start: clock.minutesOf(c.collectionFrom), end: clock.minutesOf(c.collectionUntil) };
    const onDay = intersect(window, { start: 0, end: clock.wallMinutes(1440) });
    if (!onDay) continue; // another day's pickup
    const hours = opening(site);
    if (hours.length === 0) {
      refuse(`Pickup ${c.reference}: ${site.name} is closed on ${dayName}, so the collection window ${text(onDay.start)}–${text(onDay.end)} cannot be kept.`);
      continue;
    }
    const piece = longest(hours.map((h) => intersect(onDay, h)).filter((p): p is Interval => p !== null));
    if (!piece) {
      refuse(
        `Pickup ${c.reference}: the collection window ${text(onDay.start)}–${text(onDay.end)} is outside ${site.name}'s opening hours on ${dayName} (${hoursText(site)}).`,
      );
      continue;
    }
    const notes = piece.start !== onDay.start || piece.end !== onDay.end ? [`Pickup ${c.reference}: window cut to the opening hours, ${text(piece.start)}–${text(piece.end)}.`] : [];
    const list = collectVisits.get(site.id) ?? [];
    list.push({ window: piece, orders: [{ orderId: c.orderId, reference: c.reference, role: "collect", sets: c.sets }], notes });
    collectVisits.set(site.id, list);
  }

  // Deliveries: one visit per site, served while it is open and before the earliest deadline.
  const bySite = new Map<number, DeliveryInput[]>();
  for (const d of deliveries) bySite.set(d.siteId, [...(bySite.get(d.siteId) ?? []), d]);
  for (const [siteId, items] of bySite) {
    const site = siteById.get(siteId);
    const refuseAll = (reason: (ref: string) => string) => {
      for (const ref of new Set(items.map((i) => `${i.orderId}\u0000${i.reference}`))) {
        const [orderId, reference] = ref.split("\u0000") as [string, string];
        infeasible.push({ siteId, orderId: Number(orderId), reference, role: "deliver", reason: reason(reference) });
      }
    };
    if (!site) {
      refuseAll((r) => `Return ${r}: its site is not among the active sites.`);
      continue;
    }
    const hours = opening(site);
    if (hours.length === 0) {
      refuseAll((r) => `Return ${r}: ${site.name} is closed on ${dayName}; the sets wait for its next opening day.`);
      continue;
    }
    const first = hours[0]!;
    const open: Interval = { start: first.start, end: hours[hours.length - 1]!.end };
    const notes: string[] = [];
    const deadlines = items.filter((i) => i.neededBackBy).map((i) => ({ at: clock.minutesOf(i.neededBackBy!), ref: i.reference }));
    const earliest = deadlines.sort((a, b) => a.at - b.at)[0];
    let window: Interval = longest(hours) ?? open;
    if (earliest && earliest.at <= 0) {
      notes.push(`Return ${earliest.ref} was needed back by ${dateTimeText(clock.instantOf(earliest.at), options.timeZone)}, before this day: deliver as early as the site opens.`);
      window = first;
    } else if (earliest && earliest.at < open.end) {
      const piece = hours.map((h) => intersect(h, { start: 0, end: earliest.at })).filter((p): p is Interval => p !== null).at(-1);
      if (piece) {
        window = piece;
        notes.push(`Return ${earliest.ref} is needed back by ${text(earliest.at)}.`);
      } else {
        window = first;
        notes.push(`Return ${earliest.ref} is needed back by ${text(earliest.at)}, before ${site.name} opens (${text(first.start)}): it will be late.`);
      }
    }
    const orders = new Map<number, StopOrder>();
    for (const i of items) {
      const entry = orders.get(i.orderId) ?? { orderId: i.orderId, reference: i.reference, role: "deliver" as const, sets: [] };
      entry.sets.push(i.set);
      orders.set(i.orderId, entry);
    }
    deliverVisits.set(siteId, [{ window, orders: [...orders.values()], notes }]);
  }

  // Collections at one site whose windows overlap share a visit.
  for (const [siteId, visits] of collectVisits) {
    visits.sort((a, b) => a.window.start - b.window.start || a.window.end - b.window.end);
    const merged: Visit[] = [];
    for (const v of visits) {
      const last = merged.at(-1);
      const both = last && intersect(last.window, v.window);
      if (last && both) {
        last.window = both;
        last.orders.push(...v.orders);
        last.notes.push(...v.notes);
      } else merged.push({ ...v, orders: [...v.orders], notes: [...v.notes] });
    }
    collectVisits.set(siteId, merged);
  }

  const stops: DayStop[] = [];
  const cartsFor = (orders: StopOrder[], role: "collect" | "deliver") =>
    Math.ceil(orders.filter((o) => o.role === role).reduce((n, o) => n + o.sets.length, 0) / perCart);
  const makeStop = (site: StopSite, kind: DayStop["kind"], window: Interval, hard: boolean, orders: StopOrder[], notes: string[]): DayStop => {
    const setCount = orders.reduce((n, o) => n + o.sets.length, 0);
    const ids = orders.map((o) => `${o.role}:${o.orderId}`).sort();
    return {
      key: `${site.id}|${kind}|${ids.join(",")}`,
      siteId: site.id,
      organisationId: site.organisationId,
      kind,
      windowStartMin: Math.round(window.start),
      windowEndMin: Math.round(window.end),
      hard,
      serviceMin: base + perSet * setCount,
      soiledCarts: cartsFor(orders, "collect"),
      cleanCarts: cartsFor(orders, "deliver"),
      orders,
      notes,
    };
  };

  const siteIds = [...new Set([...collectVisits.keys(), ...deliverVisits.keys()])].sort((a, b) => a - b);
  for (const siteId of siteIds) {
    const site = siteById.get(siteId)!;
    const collects = collectVisits.get(siteId) ?? [];
    let delivery = deliverVisits.get(siteId)?.[0] ?? null;
    for (const c of collects) {
      const shared = delivery ? intersect(c.window, delivery.window) : null;
      if (delivery && shared) {
        stops.push(makeStop(site, "both", shared, true, [...c.orders, ...delivery.orders], [...c.notes, ...delivery.notes]));
        delivery = null;
      } else stops.push(makeStop(site, "collection", c.window, true, c.orders, c.notes));
    }
    if (delivery) stops.push(makeStop(site, "delivery", delivery.window, false, delivery.orders, delivery.notes));
  }
  return { stops, infeasible };
}
