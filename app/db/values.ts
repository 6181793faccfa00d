/**
 * The value lists of the schema's enumerated columns, in a module of their own
 * so browser code (forms, select options) can use them without the schema and
 * the database library. `schema.ts` re-exports them.
 */

export const ROLES = ["admin", "coordinator", "analyst", "reviewer"] as const;
export type Role = (typeof ROLES)[number];

/** How a lab came into the directory, when not by an administrator (see `labs.listing`). */
export const LAB_LISTINGS = ["invited", "unchecked"] as const;

export const PASSWORD_LINK_PURPOSES = ["welcome", "reset"] as const;
export type PasswordLinkPurpose = (typeof PASSWORD_LINK_PURPOSES)[number];

export const STUDY_STATES = [
  "draft",
  "recruiting",
  "testing",
  "checking",
  "in_review",
  "published",
  "cancelled",
] as const;
export type StudyState = (typeof STUDY_STATES)[number];

/** What a study is for: a precision study (E691 / ISO 5725-2), a proficiency round, or a single-lab ruggedness screening. */
export const STUDY_KINDS = ["precision", "proficiency", "ruggedness"] as const;
export type StudyKind = (typeof STUDY_KINDS)[number];

export const RESPONSE_KINDS = ["count", "continuous"] as const;

export const FRESH_PROPERTIES = [
  "slump",
  "air_content",
  "unit_weight",
  "concrete_temperature",
  "ambient_temperature",
] as const;

export const CONSTITUENT_KINDS = [
  "cement",
  "scm",
  "water",
  "coarse_aggregate",
  "fine_aggregate",
  "admixture",
  "fiber",
  "air",
] as const;

export const ENROLLMENT_STATES = ["invited", "accepted", "declined", "withdrawn"] as const;

export const SHIPMENT_STATUSES = ["preparing", "shipped", "received", "lost"] as const;

/** How a packing list's quantity is counted. */
export const SHIPMENT_UNITS = ["kg", "g", "L", "mL", "pieces"] as const;

/** The e-mails sent on a schedule; the optional ones a person may turn off on the account page. */
export const NOTICE_KINDS = ["shipment_damaged", "shipment_lost", "enrollment_accepted", "enrollment_declined", "results_due_soon", "results_overdue"] as const;

export const CELL_STATUSES = ["draft", "submitted"] as const;

export const QUERY_STATES = ["open", "answered", "closed"] as const;

export const STATEMENT_STATES = ["draft", "in_review", "approved", "returned"] as const;

export const VOTE_CHOICES = ["approve", "object", "abstain"] as const;

export const API_SCOPES = ["results:write", "study:read"] as const;

/** Where the two mixtures of a comparison were tested: in one lab (σ_r) or in two labs (σ_R and σ_r). */
export const COMPARISON_SETTINGS = ["same-lab", "two-labs"] as const;

/** Proficiency rounds: how an assigned value is set (ISO 13528 clause 7). */
export const ASSIGNED_VALUE_METHODS = ["consensus", "reference"] as const;
export type AssignedValueMethod = (typeof ASSIGNED_VALUE_METHODS)[number];

/** Proficiency rounds: where σ_pt comes from (ISO 13528 clause 8). */
export const SIGMA_PT_METHODS = ["precision", "robust", "fixed"] as const;
export type SigmaPtMethod = (typeof SIGMA_PT_METHODS)[number];

/** Proficiency rounds: checks of the shipped material (ISO 13528 Annex B). */
export const MATERIAL_CHECKS = ["homogeneity", "stability"] as const;
export type MaterialCheck = (typeof MATERIAL_CHECKS)[number];

/** How a proficiency score reads (ISO 13528 § 9.7): |score| ≤ 2, 2 < |score| < 3, |score| ≥ 3. */
export const SCORE_VERDICTS = ["satisfactory", "questionable", "unsatisfactory"] as const;
export type ScoreVerdict = (typeof SCORE_VERDICTS)[number];
