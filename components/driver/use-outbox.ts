"use client";

import { useCallback, useEffect, useSyncExternalStore } from "react";
import { localStorageStore, memoryStore, Outbox, type OutboxItem, type OutboxStore, sendJson, type Settled } from "./outbox";

// The phone's one outbox, shared by every screen of the tab: kept in localStorage, sent when a
// screen adds to it, when the browser says it is back online, when the page becomes visible
// again, and every few seconds while anything is waiting.

const STORAGE_KEY = "steamlane.driver.outbox.v1";
const RETRY_MS = 5_000;

interface Shared {
  box: Outbox;
  /** The last list seen, the same array until it changes (what useSyncExternalStore needs). */
  snapshot: OutboxItem[];
  changed: Set<() => void>;
  settled: Set<(s: Settled) => void>;
}

let shared: Shared | null = null;

function browserStore(): OutboxStore {
  try {
    const probe = `${STORAGE_KEY}.probe`;
    window.localStorage.setItem(probe, "1");
    window.localStorage.removeItem(probe);
    return localStorageStore(window.localStorage, STORAGE_KEY);
  } catch {
    // Private mode or storage switched off: the queue still works while the page stays open.
    return memoryStore();
  }
}

function getShared(): Shared {
  if (shared) return shared;
  const changed = new Set<() => void>();
  const settled = new Set<(s: Settled) => void>();
  const box = new Outbox(browserStore(), sendJson(window.fetch.bind(window)), {
    onChange: (items) => {
      if (shared) shared.snapshot = items;
      changed.forEach((fn) => fn());
    },
    onSettled: (s) => settled.forEach((fn) => fn(s)),
  });
  const flush = () => {
    if (box.items().length > 0) void box.flush();
  };
  window.addEventListener("online", flush);
  document.addEventListener("visibilitychange", () => {
    if (document.visibilityState === "visible") flush();
  });
  window.setInterval(flush, RETRY_MS);
  shared = { box, snapshot: box.items(), changed, settled };
  return shared;
}

export interface UseOutbox {
  /** Everything waiting to be sent, oldest first. */
  items: OutboxItem[];
  /** Adds an item (its id is the clientEventId) and tries to send at once. */
  enqueue(item: Pick<OutboxItem, "id" | "url" | "body" | "label" | "group">): void;
  flush(): void;
}

const NOTHING: OutboxItem[] = [];

function subscribe(onStoreChange: () => void): () => void {
  const s = getShared();
  s.changed.add(onStoreChange);
  return () => {
    s.changed.delete(onStoreChange);
  };
}

/** The outbox, and a callback for each item that left it (sent, or refused with the server's reason). */
export function useOutbox(onSettled?: (s: Settled) => void): UseOutbox {
  const items = useSyncExternalStore(subscribe, () => getShared().snapshot, () => NOTHING);
  useEffect(() => {
    void getShared().box.flush();
  }, []);
  useEffect(() => {
    if (!onSettled) return;
    const s = getShared();
    s.settled.add(onSettled);
    return () => {
      s.settled.delete(onSettled);
    };
  }, [onSettled]);
  const enqueue = useCallback<UseOutbox["enqueue"]>((item) => {
    const s = getShared();
    s.box.enqueue(item);
    void s.box.flush();
  }, []);
  const flush = useCallback(() => void getShared().box.flush(), []);
  return { items, enqueue, flush };
}
