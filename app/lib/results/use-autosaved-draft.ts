/**
 * Keeps a form's draft safe while the analyst types: every change is copied
 * to localStorage at once and sent to the route's action through a fetcher
 * after a short pause. If the connection is down the copy stays on the
 * device and is sent when the browser is back online (or on the next visit).
 */
import { useCallback, useEffect, useRef, useState } from "react";
import { useFetcher } from "react-router";
import type { z } from "zod";

export type SaveState = "saved" | "unsaved" | "saving" | "offline" | "problems";

/** What the action answers to a draft save; `offline` comes from the route's clientAction when the request never arrived. */
export type DraftSaveReply = { offline?: boolean; stamp?: string; problems?: Record<string, string> };

type StoredCopy<T> = { draft: T; pending: boolean; stamp: string };

const SAVE_DELAY_MS = 800;
const OFFLINE_RETRY_MS = 10_000;

function readCopy<T>(key: string): StoredCopy<T> | null {
  try {
    const text = window.localStorage.getItem(key);
    return text ? (JSON.parse(text) as StoredCopy<T>) : null;
  } catch {
    return null;
  }
}

function writeCopy<T>(key: string, copy: StoredCopy<T>) {
  try {
    window.localStorage.setItem(key, JSON.stringify(copy));
  } catch {
    // Storage full or disabled: the fetcher still saves to the server.
  }
}

/**
 * `serverDraft` is the draft as stored on the server; its JSON is the stamp
 * that tells a stale device copy from one still matching the server.
 * `schema` is the one the action parses the draft with: a draft it refuses
 * stays on the device, marked, until corrected.
 */
export function useAutosavedDraft<T>({ storageKey, serverDraft, intent, schema }: { storageKey: string; serverDraft: T; intent: string; schema: z.ZodType<T> }) {
  const fetcher = useFetcher<DraftSaveReply>({ key: `autosave:${storageKey}` });
  const [draft, setDraft] = useState<T>(serverDraft);
  const [saveState, setSaveState] = useState<SaveState>("saved");
  const latest = useRef(draft);
  const stamp = useRef(JSON.stringify(serverDraft));
  const dirty = useRef(false);
  const inFlight = useRef<string | null>(null);
  const timer = useRef<ReturnType<typeof setTimeout> | undefined>(undefined);

  const flush = useCallback(() => {
    clearTimeout(timer.current);
    if (!dirty.current) return;
    if (!navigator.onLine) {
      setSaveState("offline");
      return;
    }
    if (!schema.safeParse(latest.current).success) {
      setSaveState("problems");
      return;
    }
    const json = JSON.stringify(latest.current);
    inFlight.current = json;
    setSaveState("saving");
    fetcher.submit({ intent, draft: json }, { method: "post" });
  }, [fetcher, intent, schema]);

  const schedule = useCallback(() => {
    clearTimeout(timer.current);
    timer.current = setTimeout(flush, SAVE_DELAY_MS);
  }, [flush]);

  const update = useCallback(
    (next: T) => {
      latest.current = next;
      dirty.current = true;
      setDraft(next);
      writeCopy(storageKey, { draft: next, pending: true, stamp: stamp.current });
      setSaveState("unsaved");
      schedule();
    },
    [schedule, storageKey],
  );

  // A copy typed but not yet saved wins over the server's draft; a saved copy is kept only while it still matches the server.
  useEffect(() => {
    const copy = readCopy<T>(storageKey);
    if (!copy) return;
    if (copy.pending) {
      latest.current = copy.draft;
      dirty.current = true;
      setDraft(copy.draft);
      setSaveState("unsaved");
      schedule();
    } else if (copy.stamp === stamp.current) {
      latest.current = copy.draft;
      setDraft(copy.draft);
    } else {
      window.localStorage.removeItem(storageKey);
    }
    // Only on arrival at the page.
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [storageKey]);

  useEffect(() => {
    if (fetcher.state !== "idle" || inFlight.current === null || !fetcher.data) return;
    const sent = inFlight.current;
    inFlight.current = null;
    const reply = fetcher.data;
    if (reply.offline) {
      setSaveState("offline");
      return;
    }
    if (reply.stamp) stamp.current = reply.stamp;
    if (JSON.stringify(latest.current) === sent) {
      dirty.current = false;
      writeCopy(storageKey, { draft: latest.current, pending: false, stamp: stamp.current });
      setSaveState(reply.problems && Object.keys(reply.problems).length > 0 ? "problems" : "saved");
    } else {
      schedule();
    }
  }, [fetcher.state, fetcher.data, schedule, storageKey]);

  useEffect(() => {
    const retry = setInterval(() => {
      if (dirty.current && inFlight.current === null && navigator.onLine) flush();
    }, OFFLINE_RETRY_MS);
    window.addEventListener("online", flush);
    return () => {
      clearInterval(retry);
      window.removeEventListener("online", flush);
    };
  }, [flush]);

  const forget = useCallback(() => window.localStorage.removeItem(storageKey), [storageKey]);

  return { draft, update, saveState, problems: fetcher.data?.problems ?? {}, forget, flush };
}

export const SAVE_STATE_TEXT: Record<SaveState, string> = {
  saved: "All changes saved",
  unsaved: "Unsaved changes…",
  saving: "Saving…",
  offline: "Offline: your entries are kept on this device and saved when the connection returns",
  problems: "Not all saved: correct the fields marked below",
};
