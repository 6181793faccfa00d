/**
 * What the result entry page's autosave sends, built the way the browser
 * builds it: the page's draft as loaded is the base, the edits are laid over
 * it, and only what changed goes out, with the version each value was read at.
 */
import { draftChanges, type EntryDraft } from "~/lib/results/entry-draft";
import * as entry from "~/routes/lab/study/result-entry";
import { call, get } from "./routes";

export type DraftEdit = Partial<Pick<EntryDraft, "values" | "testedOn" | "operator" | "fresh">> & { batchedAt?: string };

/** Loads the page as `cookie` and returns the changes an autosave of `edit` would send. */
export async function entryChanges(cookie: string, studyId: string | number, materialId: string | number, edit: DraftEdit, base?: EntryDraft) {
  const params = { studyId: String(studyId), materialId: String(materialId) };
  const page = await call(entry.loader, get(`/lab/studies/${studyId}/results/${materialId}`, cookie), params);
  if (page.status !== 200) throw new Error(`The entry page answered ${page.status}`);
  const read: EntryDraft = base ?? page.data.draft;
  const next: EntryDraft = {
    ...read,
    values: { ...read.values, ...edit.values },
    testedOn: { ...read.testedOn, ...edit.testedOn },
    operator: { ...read.operator, ...edit.operator },
    fresh: { ...read.fresh, ...edit.fresh },
    batchedAt: edit.batchedAt ?? read.batchedAt,
  };
  const keys = page.data.responses.filter((r: { cell: { status: string } | null }) => r.cell?.status !== "submitted").map((r: { key: string }) => r.key);
  return { changes: JSON.stringify(draftChanges(read, next, keys, page.data.study.replicatesPerCell)), read };
}
