/**
 * Keeps a form's draft safe while the analyst types: every change is copied
 * to localStorage at once and sent to the route's action through a fetcher
 * after a short pause. If the connection is down the copy stays on the
 * device and is sent when the browser is back online (or on the next visit).
 *
 * With `changes`, only what changed since the draft was read is sent (with
 * whatever the route needs to detect a conflict, such as the version each
 * field was read at), and with `rebase` each answer's server draft is folded
 * in: fields the person did not touch take the server's value, and fields in
 * conflict take the other person's value, so nothing is overwritten silently.
 */
import { useCallback, useEffect, useRef, useState } from "react";
import { useFetcher } from "react-router";
import type { z } from "zod";

export type SaveState = "saved" | "unsaved" | "saving" | "offline" | "problems" | "conflict";

/**
 * What the action answers to a draft save; `offline` comes from the route's
 * clientAction when the request never arrived; `conflicts` names fields
 * someone else changed after this draft was read, with the message to show.
 */
export type DraftSaveReply = { offline?: boolean; stamp?: string; problems?: Record<string, string>; conflicts?: Record<string, string> };

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
export function useAutosavedDraft<T>({
  storageKey,
  serverDraft,
  intent,
  schema,
  changes,
  rebase,
}: {
  storageKey: string;
  serverDraft: T;
  intent: string;
  schema: z.ZodType<T>;
  changes?: (base: T, draft: T) => unknown;
  rebase?: (draft: T, oldBase: T, newBase: T, conflicts: string[]) => T;
}) {
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
    const body = changes ? JSON.stringify(changes(JSON.parse(stamp.current) as T, latest.current)) : json;
    fetcher.submit({ intent, draft: body }, { method: "post" });
  }, [fetcher, intent, schema, changes]);

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
    const conflicts = Object.keys(reply.conflicts ?? {});
    const typedMeanwhile = JSON.stringify(latest.current) !== sent;
    if (reply.stamp && rebase) {
      const rebased = rebase(latest.current, JSON.parse(stamp.current) as T, JSON.parse(reply.stamp) as T, conflicts);
      latest.current = rebased;
      setDraft(rebased);
    }
    if (reply.stamp) stamp.current = reply.stamp;
    if (!typedMeanwhile) {
      dirty.current = false;
      writeCopy(storageKey, { draft: latest.current, pending: false, stamp: stamp.current });
      setSaveState(conflicts.length > 0 ? "conflict" : reply.problems && Object.keys(reply.problems).length > 0 ? "problems" : "saved");
    } else {
      schedule();
    }
  }, [fetcher.state, fetcher.data, schedule, storageKey, rebase]);

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

  /** The server's draft this one was last read from or saved to; what changed is measured against it. */
  const base = useCallback(() => JSON.parse(stamp.current) as T, []);

  return { draft, update, saveState, problems: fetcher.data?.problems ?? {}, conflicts: fetcher.data?.conflicts ?? {}, forget, flush, base };
}

export const SAVE_STATE_TEXT: Record<SaveState, string> = {
  saved: "All changes saved",
  unsaved: "Unsaved changes…",
  saving: "Saving…",
  offline: "Offline: your entries are kept on this device and saved when the connection returns",
  problems: "Not all saved: correct the fields marked below",
  conflict: "Someone else changed a field you were editing: see the message beside it",
};
