/**
 * Characters no name or note needs and that can deceive: NUL and the other
 * control characters (a NUL cuts a name short in other programs), and the
 * Unicode bidirectional controls (Unicode Standard Annex #9), which can make
 * one name display as another ("Trojan Source", CVE-2021-42574). Line breaks
 * and tabs are allowed in multi-line text only.
 */
const CONTROL = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f-\u009f]/;
const LINE_BREAK_OR_TAB = /[\t\n\r]/;
const BIDI_CONTROL = /[\u061c\u200e\u200f\u202a-\u202e\u2066-\u2069]/;

/** Why the text is refused, or null when it is clean. */
export function unsafeCharacterMessage(text: string, { multiline = false }: { multiline?: boolean } = {}) {
  if (CONTROL.test(text) || (!multiline && LINE_BREAK_OR_TAB.test(text))) {
    return multiline ? "Remove the control characters (invisible characters other than line breaks and tabs)." : "Remove the control characters (invisible characters such as tabs or line breaks).";
  }
  if (BIDI_CONTROL.test(text)) return "Remove the text-direction characters: they can make the text display as something else.";
  return null;
}

/** A zod check for `.superRefine`: adds the message to the field when the text holds refused characters. */
export const refuseUnsafeCharacters =
  (options: { multiline?: boolean } = {}) =>
  (text: string, ctx: { addIssue: (issue: { code: "custom"; message: string }) => void }) => {
    const message = unsafeCharacterMessage(text, options);
    if (message) ctx.addIssue({ code: "custom", message });
  };
