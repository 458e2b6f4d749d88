import { describe, expect, it, vi } from "vitest";
import {
  localStorageStore,
  memoryStore,
  Outbox,
  type OutboxItem,
  parseStored,
  type SendResult,
  sendJson,
  type Settled,
} from "@/components/driver/outbox";

// The driver's outbox: order kept, a failed send tried again later, nothing sent twice.

const scan = (id: string, group = "stop:1") => ({ id, url: `/api/runs/1/stops/1/scans`, body: { code: `SL-${id}` }, label: `Scan ${id}`, group });

/** A server that answers from a script, recording what it was sent. */
function scriptedServer(answers: Record<string, SendResult[]>) {
  const seen: string[] = [];
  const send = vi.fn(async (item: OutboxItem): Promise<SendResult> => {
    seen.push(item.id);
    const queue = answers[item.id];
    return queue && queue.length > 0 ? queue.shift()! : { kind: "sent", data: { ok: item.id } };
  });
  return { send, seen };
}

describe("the driver's outbox", () => {
  it("sends items in the order they were made and empties the queue", async () => {
    const server = scriptedServer({});
    const box = new Outbox(memoryStore(), server.send);
    for (const id of ["a", "b", "c"]) box.enqueue(scan(id));
    const report = await box.flush();
    expect(server.seen).toEqual(["a", "b", "c"]);
    expect(report).toEqual({ sent: 3, refused: 0, waiting: 0, stoppedBy: null });
    expect(box.items()).toEqual([]);
  });

  it("puts the item's id into the body as its clientEventId", async () => {
    const server = scriptedServer({});
    const box = new Outbox(memoryStore(), server.send);
    box.enqueue(scan("x1"));
    await box.flush();
    expect(server.send.mock.calls[0]![0].body).toEqual({ code: "SL-x1", clientEventId: "x1" });
  });

  it("stops at the first item that cannot be sent, keeps it and everything after it, and sends them later in order", async () => {
    const server = scriptedServer({ b: [{ kind: "retry", message: "No connection to the server." }] });
    const box = new Outbox(memoryStore(), server.send);
    for (const id of ["a", "b", "c"]) box.enqueue(scan(id));
    const first = await box.flush();
    expect(first).toEqual({ sent: 1, refused: 0, waiting: 2, stoppedBy: "No connection to the server." });
    expect(box.items().map((i) => i.id)).toEqual(["b", "c"]);
    expect(box.items()[0]).toMatchObject({ attempts: 1, lastError: "No connection to the server." });
    // c was not tried while b was stuck: a completion never overtakes its scans.
    expect(server.seen).toEqual(["a", "b"]);
    const second = await box.flush();
    expect(second.sent).toBe(2);
    expect(server.seen).toEqual(["a", "b", "b", "c"]);
    expect(box.items()).toEqual([]);
  });

  it("treats a thrown send as a retry, not a loss", async () => {
    const send = vi.fn(async (): Promise<SendResult> => {
      throw new TypeError("Failed to fetch");
    });
    const box = new Outbox(memoryStore(), send);
    box.enqueue(scan("a"));
    const report = await box.flush();
    expect(report.waiting).toBe(1);
    expect(box.items()[0]!.lastError).toBe("Failed to fetch");
  });

  it("drops an item the server refused, reports it once with the reason, and goes on", async () => {
    const settled: Settled[] = [];
    const server = scriptedServer({ a: [{ kind: "refused", status: 409, message: "That set belongs to another stop." }] });
    const box = new Outbox(memoryStore(), server.send, { onSettled: (s) => settled.push(s) });
    box.enqueue(scan("a"));
    box.enqueue(scan("b"));
    const report = await box.flush();
    expect(report).toMatchObject({ sent: 1, refused: 1, waiting: 0 });
    expect(settled.map((s) => [s.item.id, s.result.kind])).toEqual([
      ["a", "refused"],
      ["b", "sent"],
    ]);
    await box.flush();
    expect(settled).toHaveLength(2);
  });

  it("ignores an item whose id is already waiting", async () => {
    const server = scriptedServer({});
    const box = new Outbox(memoryStore(), server.send);
    expect(box.enqueue(scan("a"))).toBe(true);
    expect(box.enqueue(scan("a"))).toBe(false);
    expect(box.items()).toHaveLength(1);
    await box.flush();
    expect(server.seen).toEqual(["a"]);
  });

  it("never sends an item twice when flushes overlap (the online event and the timer at once)", async () => {
    let release: () => void = () => {};
    const gate = new Promise<void>((resolve) => {
      release = resolve;
    });
    const seen: string[] = [];
    const send = async (item: OutboxItem): Promise<SendResult> => {
      seen.push(item.id);
      await gate;
      return { kind: "sent", data: null };
    };
    const box = new Outbox(memoryStore(), send);
    box.enqueue(scan("a"));
    box.enqueue(scan("b"));
    const one = box.flush();
    const two = box.flush();
    const three = box.flush();
    release();
    const reports = await Promise.all([one, two, three]);
    expect(seen).toEqual(["a", "b"]);
    expect(reports[0]).toBe(reports[1]);
    expect(reports[0]!.sent).toBe(2);
  });

  it("sends an item added while a round is running in the same round, after the others", async () => {
    const store = memoryStore();
    const seen: string[] = [];
    const holder: { box?: Outbox } = {};
    const send = async (item: OutboxItem): Promise<SendResult> => {
      seen.push(item.id);
      if (item.id === "a") holder.box!.enqueue(scan("late"));
      return { kind: "sent", data: null };
    };
    const box = new Outbox(store, send);
    holder.box = box;
    box.enqueue(scan("a"));
    box.enqueue(scan("b"));
    await box.flush();
    expect(seen).toEqual(["a", "b", "late"]);
  });

  it("keeps the queue in storage, so a reloaded page sends what an earlier one queued", async () => {
    const backing = new Map<string, string>();
    const storage = { getItem: (k: string) => backing.get(k) ?? null, setItem: (k: string, v: string) => void backing.set(k, v) };
    const offline = new Outbox(localStorageStore(storage, "q"), async () => ({ kind: "retry", message: "offline" }));
    offline.enqueue(scan("a"));
    offline.enqueue(scan("b"));
    await offline.flush();
    const server = scriptedServer({});
    const reloaded = new Outbox(localStorageStore(storage, "q"), server.send);
    expect(reloaded.items().map((i) => i.id)).toEqual(["a", "b"]);
    await reloaded.flush();
    expect(server.seen).toEqual(["a", "b"]);
    expect(JSON.parse(backing.get("q")!)).toEqual([]);
  });

  it("keeps an unreadable stored queue aside instead of dropping it", () => {
    expect(parseStored(null)).toEqual({ items: [], unreadable: false });
    expect(parseStored("{not json")).toEqual({ items: [], unreadable: true });
    const backing = new Map<string, string>([["q", "[{\"id\":1}]"]]);
    const storage = { getItem: (k: string) => backing.get(k) ?? null, setItem: (k: string, v: string) => void backing.set(k, v) };
    expect(localStorageStore(storage, "q").load()).toEqual([]);
    expect(backing.get("q.unreadable")).toBe("[{\"id\":1}]");
  });

  it("reports each change of the waiting list", async () => {
    const sizes: number[] = [];
    const box = new Outbox(memoryStore(), async () => ({ kind: "sent", data: null }), { onChange: (items) => sizes.push(items.length) });
    box.enqueue(scan("a"));
    box.enqueue(scan("b"));
    await box.flush();
    expect(sizes).toEqual([1, 2, 1, 0]);
  });
});

describe("sorting a server's answer", () => {
  const item: OutboxItem = { ...scan("a"), body: { clientEventId: "a" }, createdAt: "2026-12-02T08:00:00.000Z", attempts: 0, lastError: null };
  const answer = (status: number, body: unknown) => vi.fn(async () => new Response(JSON.stringify(body), { status })) as unknown as typeof fetch;

  it("takes a 2xx as sent, with its body", async () => {
    expect(await sendJson(answer(200, { duplicate: true }))(item)).toEqual({ kind: "sent", data: { duplicate: true } });
  });

  it("takes a refusal (4xx) as final, with the server's message", async () => {
    expect(await sendJson(answer(409, { error: { code: "conflict", message: "Not on this stop." } }))(item)).toEqual({
      kind: "refused",
      status: 409,
      message: "Not on this stop.",
    });
    expect((await sendJson(answer(404, { error: { code: "not_found", message: "That run was not found." } }))(item)).kind).toBe("refused");
  });

  it("tries again after a server fault, a throttle, an ended session or no connection", async () => {
    expect((await sendJson(answer(503, {}))(item)).kind).toBe("retry");
    expect((await sendJson(answer(500, { error: { message: "boom" } }))(item)).kind).toBe("retry");
    expect((await sendJson(answer(429, {}))(item)).kind).toBe("retry");
    expect((await sendJson(answer(401, {}))(item)).kind).toBe("retry");
    const down = vi.fn(async () => {
      throw new TypeError("Failed to fetch");
    }) as unknown as typeof fetch;
    expect(await sendJson(down)(item)).toEqual({ kind: "retry", message: "No connection to the server." });
  });
});
