/**
 * The result entry form's draft and what an autosave sends of it: only the
 * replicates whose value, test date or operator changed since the draft was
 * read, each with the version it was read at, and only the fresh properties
 * that changed. Pure, so the browser and the tests share it.
 */
import type { DraftChanges, EntryDraft } from "./entry-forms";

export type { DraftChanges, EntryDraft };

type ChangedReplicate = DraftChanges["rows"][number];

export function draftChanges(base: EntryDraft, draft: EntryDraft, responseKeys: readonly string[], replicates: number): DraftChanges {
  const rows: ChangedReplicate[] = [];
  for (const response of responseKeys) {
    for (let replicate = 1; replicate <= replicates; replicate++) {
      const key = `${response}:${replicate}`;
      const changed =
        (draft.values[key] ?? "") !== (base.values[key] ?? "") ||
        (draft.testedOn[replicate] ?? "") !== (base.testedOn[replicate] ?? "") ||
        (draft.operator[replicate] ?? "") !== (base.operator[replicate] ?? "");
      if (!changed) continue;
      rows.push({
        response,
        replicate,
        value: draft.values[key] ?? "",
        testedOn: draft.testedOn[replicate] ?? "",
        operator: draft.operator[replicate] ?? "",
        readVersion: base.versions[key] ?? 0,
      });
    }
  }
  const fresh = Object.fromEntries(
    (Object.keys(draft.fresh) as (keyof EntryDraft["fresh"])[]).filter((p) => (draft.fresh[p] ?? "") !== (base.fresh[p] ?? "")).map((p) => [p, draft.fresh[p] ?? ""]),
  );
  return { rows, fresh, ...(draft.batchedAt !== base.batchedAt ? { batchedAt: draft.batchedAt } : {}) };
}

/**
 * Folds the server's new draft into the one on screen: what the person did
 * not change since `oldBase` takes the server's value; a field in conflict
 * takes the other person's value (the message beside it quotes the one that
 * was not saved). Versions always come from the server.
 */
export function rebaseDraft(draft: EntryDraft, oldBase: EntryDraft, newBase: EntryDraft, conflicts: readonly string[]): EntryDraft {
  const merge = (mine: Record<string, string>, old: Record<string, string>, next: Record<string, string>, conflictKey: (k: string) => boolean) => {
    const out: Record<string, string> = { ...mine };
    for (const key of new Set([...Object.keys(old), ...Object.keys(next), ...Object.keys(mine)])) {
      if (conflictKey(key) || (mine[key] ?? "") === (old[key] ?? "")) out[key] = next[key] ?? "";
    }
    return out;
  };
  const conflictSet = new Set(conflicts);
  return {
    values: merge(draft.values, oldBase.values, newBase.values, (k) => conflictSet.has(k)),
    testedOn: merge(draft.testedOn, oldBase.testedOn, newBase.testedOn, () => false),
    operator: merge(draft.operator, oldBase.operator, newBase.operator, () => false),
    fresh: merge(draft.fresh as Record<string, string>, oldBase.fresh as Record<string, string>, newBase.fresh as Record<string, string>, () => false),
    batchedAt: draft.batchedAt === oldBase.batchedAt ? newBase.batchedAt : draft.batchedAt,
    versions: newBase.versions,
  };
}
