import { describe, expect, it } from "vitest";
import { describeAuditEvent, type StoredAuditEvent } from "./audit-sentences";

const event = (action: string, fields: Partial<StoredAuditEvent> = {}): StoredAuditEvent => ({
  action,
  before: null,
  after: null,
  reason: null,
  actorName: "Dana Coordinator",
  labCode: "L03",
  ...fields,
});

describe("audit trail sentences", () => {
  it("reads a receipt with its condition and date", () => {
    const e = event("shipment_received", { before: { status: "shipped", id: 16, enrollmentId: 16 }, after: { status: "received", receivedOn: "2026-09-04", condition: "good", receiptNotes: "" } });
    expect(describeAuditEvent(e)).toBe("L03 received the shipment, condition good, 2026-09-04");
  });

  it("reads a corrected receipt as field changes", () => {
    const e = event("shipment_receipt_corrected", { before: { condition: "good", receivedOn: "2026-09-04" }, after: { condition: "damaged", receivedOn: "2026-09-04" } });
    expect(describeAuditEvent(e)).toBe("L03 corrected the receipt: condition good → damaged");
  });

  it("reads fresh property changes with their units", () => {
    const e = event("batch.fresh_properties_saved", { before: { slumpMm: 180, airContentPercent: 5.5 }, after: { slumpMm: 175, airContentPercent: 6 } });
    expect(describeAuditEvent(e)).toBe("L03 recorded fresh properties: slump 180 → 175 mm, air content 5.5 → 6 %");
  });

  it("reads a corrected fresh property with its reason, and the batching time without its T", () => {
    const e = event("batch.fresh_properties_amended", { before: { batchedAt: "2026-09-04T09:00" }, after: { batchedAt: "2026-09-04T10:30", queryId: 4 }, reason: "Clock was an hour slow" });
    expect(describeAuditEvent(e)).toBe("L03 corrected fresh properties: batching time 2026-09-04 09:00 → 2026-09-04 10:30. Reason: Clock was an hour slow");
  });

  it("reads draft saves as replicate changes, four at most", () => {
    const rows = [1, 2, 3, 4, 5].map((replicate) => ({ material: "M1", response: "holes", replicate }));
    const e = event("results.draft_saved", { before: rows.map((r) => ({ ...r, value: r.replicate === 1 ? 3 : null })), after: rows.map((r) => ({ ...r, value: r.replicate === 2 ? null : 4 })) });
    expect(describeAuditEvent(e)).toBe("L03 saved draft results: M1 holes r1 3 → 4; M1 holes r2 — → cleared; M1 holes r3 = 4; M1 holes r4 = 4; and 1 more");
  });

  it("reads an import with the file it came from", () => {
    const e = event("results.imported", { before: [{ material: "M2", response: "surface", replicate: 1, value: null }], after: [{ material: "M2", response: "surface", replicate: 1, value: 12 }], reason: "CSV import of l03.csv (1 rows)" });
    expect(describeAuditEvent(e)).toBe("L03 imported results: M2 surface r1 = 12. Reason: CSV import of l03.csv (1 rows)");
  });

  it("reads a submission with its cell count", () => {
    expect(describeAuditEvent(event("results.submitted", { after: { material: "M1", cells: [{ cellId: 1 }, { cellId: 2 }] } }))).toBe("L03 submitted the results of M1 (2 cells)");
  });

  it("reads an amendment as old → new with the reason, without float noise", () => {
    const where = { material: "M1", response: "holes", replicate: 2 };
    const e = event("result.amended", { before: { ...where, value: 0.1 + 0.2 }, after: { ...where, value: 7 }, reason: "Typing slip" });
    expect(describeAuditEvent(e)).toBe("L03 amended M1 holes r2: 0.3 → 7. Reason: Typing slip");
  });

  it("reads a photo, a shipment, a loss and the invitation answers", () => {
    expect(describeAuditEvent(event("result.photo_added", { after: { material: "M3", replicate: 2, attachmentId: 9 } }))).toBe("L03 added a photo to M3 replicate 2");
    expect(describeAuditEvent(event("shipment_created"))).toBe("Dana Coordinator prepared a shipment for L03");
    expect(describeAuditEvent(event("shipment_shipped", { after: { shippedOn: "2026-08-30", carrier: "Ridgeway Freight", status: "shipped" } }))).toBe(
      "Dana Coordinator shipped the materials to L03 by Ridgeway Freight, 2026-08-30",
    );
    expect(describeAuditEvent(event("shipment_lost"))).toBe("Dana Coordinator marked the shipment to L03 lost");
    expect(describeAuditEvent(event("invitation_accepted", { after: { labCode: "L07" }, labCode: null }))).toBe("L07 accepted the invitation");
    expect(describeAuditEvent(event("invitation_declined", { labCode: null }))).toBe("The lab declined the invitation");
    expect(describeAuditEvent(event("lab_invited"))).toBe("Dana Coordinator invited a lab");
    expect(describeAuditEvent(event("lab_withdrawn", { reason: "Mixer broke down" }))).toBe("Dana Coordinator withdrew L03 from the study. Reason: Mixer broke down");
  });

  it("reads queries and cell decisions", () => {
    expect(describeAuditEvent(event("query.raised", { after: { lab: "L03", material: "M2", response: "holes", statistic: "h = 2.41", asksCorrection: true } }))).toBe(
      "Dana Coordinator asked L03 about M2 holes (h = 2.41), asking for a correction",
    );
    expect(describeAuditEvent(event("query.answered", { after: { answer: "Re-checked" } }))).toBe("L03 answered a query");
    expect(describeAuditEvent(event("query.closed"))).toBe("Dana Coordinator closed the query to L03");
    expect(
      describeAuditEvent(event("cell_decision.saved", { before: { decision: "retained" }, after: { lab: "L03", material: "M2", response: "holes", decision: "excluded" }, reason: "Form leaked" })),
    ).toBe("Dana Coordinator excluded L03 M2 holes (was retained). Reason: Form leaked");
  });

  it("reads a study move and a reminder", () => {
    expect(describeAuditEvent(event("study_state_changed", { before: { state: "testing" }, after: { state: "in_review" } }))).toBe("Dana Coordinator moved the study from testing to in review");
    expect(describeAuditEvent(event("missing_results_reminded", { after: { labs: ["L01", "L02"] } }))).toBe("Dana Coordinator reminded 2 labs of missing results");
  });

  it("falls back to the action in words, never raw fields", () => {
    const sentence = describeAuditEvent(event("mixture_design_saved", { after: { id: 16, enrollmentId: 16 }, actorName: null }));
    expect(sentence).toBe("Someone: mixture design saved");
    expect(sentence).not.toMatch(/enrollmentId|_/);
  });
});
