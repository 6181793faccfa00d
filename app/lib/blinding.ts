/**
 * Reviewers see labs by code only. Free text the coordinator writes about a
 * cell (a decision's reason, a query) reaches the committee word for word, so
 * text that names one of the study's labs, a lab's people or their e-mail
 * addresses is refused before it is stored. Matching is case-insensitive and
 * on whole words: "Tessel Ready-Mix QC" is found in "asked tessel ready-mix qc
 * twice", but a name is not found inside a longer word.
 */

export type Identity = { kind: "lab" | "person" | "email"; text: string };

const KIND_WORD: Record<Identity["kind"], string> = { lab: "the lab", person: "the person", email: "the e-mail address" };

const escape = (text: string) => text.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");

/** A letter, a digit, or (inside e-mail addresses) the characters that join their parts. */
const WORD_CHARACTER = "[\\p{L}\\p{N}_@]";

function pattern(identity: Identity) {
  // Any run of spaces or line breaks between the words of a name still matches.
  const body = identity.text.trim().split(/\s+/).map(escape).join("\\s+");
  return new RegExp(`(?<!${WORD_CHARACTER})${body}(?!${WORD_CHARACTER})`, "giu");
}

/** The identities the text names, each once, in the order given. */
export function namedIdentities(text: string, identities: readonly Identity[]): Identity[] {
  const seen = new Set<string>();
  return identities.filter((identity) => {
    const key = identity.text.trim().toLowerCase();
    if (key.length < 2 || seen.has(key)) return false;
    seen.add(key);
    return pattern(identity).test(text);
  });
}

/** Why the text cannot go to the committee, or null when it names nobody of the study. */
export function blindingRefusal(text: string, identities: readonly Identity[]): string | null {
  const named = namedIdentities(text, identities);
  if (named.length === 0) return null;
  const list = named.map((identity) => `${KIND_WORD[identity.kind]} “${identity.text.trim()}”`).join(", ");
  return `Reviewers see labs by code only: remove ${list}, and name the lab by its code (e.g. L04).`;
}

/** Per form field, why its text cannot go to the committee; null when no field names anybody of the study. */
export function blindingRefusals(fields: Record<string, string>, identities: readonly Identity[]): Record<string, string[]> | null {
  const refused = Object.entries(fields).flatMap(([field, text]) => {
    const refusal = blindingRefusal(text, identities);
    return refusal ? [[field, [refusal]] satisfies [string, string[]]] : [];
  });
  return refused.length > 0 ? Object.fromEntries(refused) : null;
}

/** The text with every identity it names replaced, for text stored before the check existed. */
export function withheldIdentities(text: string, identities: readonly Identity[]): string {
  return namedIdentities(text, identities).reduce((out, identity) => out.replace(pattern(identity), "[withheld]"), text);
}
