/**
 * The whole Ringbatch data model in one place (vocabulary of the product design:
 * study, response, material, lab, enrollment, shipment, cell, result, query,
 * cell decision, precision statement, vote). drizzle-kit generates the
 * migrations in drizzle/ from this file.
 */
import { sql } from "drizzle-orm";
import {
  type AnySQLiteColumn,
  index,
  integer,
  primaryKey,
  real,
  sqliteTable,
  text,
  uniqueIndex,
} from "drizzle-orm/sqlite-core";
import { LAB_LISTINGS, PASSWORD_LINK_PURPOSES, ROLES, STUDY_KINDS, STUDY_STATES, RESPONSE_KINDS, FRESH_PROPERTIES, CONSTITUENT_KINDS, ENROLLMENT_STATES, SHIPMENT_STATUSES, SHIPMENT_UNITS, NOTICE_KINDS, CELL_STATUSES, QUERY_STATES, STATEMENT_STATES, VOTE_CHOICES, API_SCOPES, COMPARISON_SETTINGS, ASSIGNED_VALUE_METHODS, SIGMA_PT_METHODS, MATERIAL_CHECKS, SCORE_VERDICTS } from "./values";

export * from "./values";

/** The owner's id in a row that goes with its owner when that is deleted. */
const ownedBy = <N extends string>(name: N, owner: () => AnySQLiteColumn) => integer(name).notNull().references(owner, { onDelete: "cascade" });

const studyIdColumn = () => ownedBy("study_id", () => studies.id);
const userIdColumn = () => ownedBy("user_id", () => users.id);
const enrollmentIdColumn = () => ownedBy("enrollment_id", () => enrollments.id);
const materialIdColumn = () => ownedBy("material_id", () => materials.id);

/** The material × response a row is about: one group of the analysis. */
const groupColumns = () => ({ materialId: materialIdColumn(), responseId: ownedBy("response_id", () => responses.id) });

/** A person the row names (who raised, decided or wrote it); their account stays while a row names it. */
const personColumn = <N extends string>(name: N) => integer(name).notNull().references(() => users.id);

/** The lab taking part; a lab is never deleted (a merged one keeps its row), so nothing cascades. */
const labIdColumn = () => integer("lab_id").notNull().references(() => labs.id);

const createdAt = () =>
  integer("created_at", { mode: "timestamp_ms" })
    .notNull()
    .default(sql`(unixepoch('subsec') * 1000)`);

export const users = sqliteTable("users", {
  id: integer("id").primaryKey({ autoIncrement: true }),
  email: text("email").notNull().unique(),
  name: text("name").notNull(),
  /** The role that decides the home page; scope comes from memberships and assignments. */
  role: text("role", { enum: ROLES }).notNull(),
  passwordHash: text("password_hash"),
  disabledAt: integer("disabled_at", { mode: "timestamp_ms" }),
  createdAt: createdAt(),
});

/** Roles a person holds besides `users.role` (an analyst of a lab who also sits on the committee). */
export const userRoles = sqliteTable(
  "user_roles",
  {
    userId: userIdColumn(),
    role: text("role", { enum: ROLES }).notNull(),
  },
  (t) => [primaryKey({ columns: [t.userId, t.role] })],
);

export const labs = sqliteTable("labs", {
  id: integer("id").primaryKey({ autoIncrement: true }),
  name: text("name").notNull().unique(),
  address: text("address").notNull().default(""),
  contactName: text("contact_name").notNull().default(""),
  contactEmail: text("contact_email").notNull().default(""),
  accreditationNumber: text("accreditation_number").notNull().default(""),
  /**
   * Null for a lab of the directory. A lab a coordinator invited by name and
   * e-mail is `invited` until it accepts, then `unchecked` until an
   * administrator has looked for a duplicate of it.
   */
  listing: text("listing", { enum: LAB_LISTINGS }),
  /** The lab this one was merged into; a merged lab leaves the directory and every picker. */
  mergedIntoId: integer("merged_into_id").references((): AnySQLiteColumn => labs.id),
  createdAt: createdAt(),
});

export const labMembers = sqliteTable(
  "lab_members",
  {
    labId: ownedBy("lab_id", () => labs.id),
    userId: userIdColumn(),
    /** The lab's contact receives invitations and may add colleagues. */
    isContact: integer("is_contact", { mode: "boolean" }).notNull().default(false),
  },
  (t) => [primaryKey({ columns: [t.labId, t.userId] }), index("lab_members_user").on(t.userId)],
);

/** A link that lets a new account set its first password (a lab contact's colleague). Only the hash is kept. */
export const passwordTokens = sqliteTable(
  "password_tokens",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    userId: userIdColumn(),
    tokenHash: text("token_hash").notNull().unique(),
    /** A first password (`welcome`, 14 days) or a forgotten one (`reset`, 30 minutes). */
    purpose: text("purpose", { enum: PASSWORD_LINK_PURPOSES }).notNull().default("welcome"),
    expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
    usedAt: integer("used_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (t) => [index("password_tokens_user").on(t.userId)],
);

export const studies = sqliteTable("studies", {
  id: integer("id").primaryKey({ autoIncrement: true }),
  code: text("code").notNull().unique(),
  title: text("title").notNull(),
  kind: text("kind", { enum: STUDY_KINDS }).notNull().default("precision"),
  testMethod: text("test_method").notNull(),
  notes: text("notes").notNull().default(""),
  state: text("state", { enum: STUDY_STATES }).notNull().default("draft"),
  replicatesPerCell: integer("replicates_per_cell").notNull(),
  /** Significance level for the h and k consistency flags (E691 uses 0.005). */
  significanceLevel: real("significance_level").notNull().default(0.005),
  /** Float finishing test: target surface rating on the 1–3 visual scale. */
  targetSurfaceRating: integer("target_surface_rating"),
  /** Concrete in one specimen of the test method, m³, and the waste allowance in %; the batch sheet's suggested volume. Null until set. */
  specimenVolumeM3: real("specimen_volume_m3"),
  wastePercent: real("waste_percent"),
  enrollmentDeadline: text("enrollment_deadline"),
  shipDate: text("ship_date"),
  resultsDue: text("results_due"),
  ownerId: personColumn("owner_id"),
  protocolAttachmentId: integer("protocol_attachment_id").references(() => attachments.id),
  /** Bumped on every change of results or decisions; analyses are cached by it. */
  dataVersion: integer("data_version").notNull().default(0),
  createdAt: createdAt(),
});

/** A study's row, as every model and page reads it. */
export type Study = typeof studies.$inferSelect;

export const studyCoordinators = sqliteTable(
  "study_coordinators",
  {
    studyId: studyIdColumn(),
    userId: userIdColumn(),
  },
  (t) => [primaryKey({ columns: [t.studyId, t.userId] }), index("study_coordinators_user").on(t.userId)],
);

export const studyReviewers = sqliteTable(
  "study_reviewers",
  {
    studyId: studyIdColumn(),
    userId: userIdColumn(),
  },
  (t) => [primaryKey({ columns: [t.studyId, t.userId] }), index("study_reviewers_user").on(t.userId)],
);

export const responses = sqliteTable(
  "responses",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    studyId: studyIdColumn(),
    /** Short key used in CSV files and the API, e.g. `holes`. */
    key: text("key").notNull(),
    name: text("name").notNull(),
    unit: text("unit").notNull().default(""),
    kind: text("kind", { enum: RESPONSE_KINDS }).notNull(),
    decimals: integer("decimals").notNull().default(0),
    plausibleMin: real("plausible_min"),
    plausibleMax: real("plausible_max"),
    sortOrder: integer("sort_order").notNull().default(0),
  },
  (t) => [uniqueIndex("responses_study_key").on(t.studyId, t.key)],
);

export const freshPropertyTargets = sqliteTable(
  "fresh_property_targets",
  {
    studyId: studyIdColumn(),
    property: text("property", { enum: FRESH_PROPERTIES }).notNull(),
    /** SI values: mm, %, kg/m³, °C. */
    target: real("target").notNull(),
    tolerance: real("tolerance").notNull(),
  },
  (t) => [primaryKey({ columns: [t.studyId, t.property] })],
);

export const materials = sqliteTable(
  "materials",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    studyId: studyIdColumn(),
    code: text("code").notNull(),
    description: text("description").notNull().default(""),
    sortOrder: integer("sort_order").notNull().default(0),
  },
  (t) => [uniqueIndex("materials_study_code").on(t.studyId, t.code)],
);

/** One row of a material's mixture design, per 1 m³ on an SSD basis. */
export const mixtureConstituents = sqliteTable(
  "mixture_constituents",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    materialId: materialIdColumn(),
    kind: text("kind", { enum: CONSTITUENT_KINDS }).notNull(),
    name: text("name").notNull(),
    lot: text("lot").notNull().default(""),
    ssdMassKgPerM3: real("ssd_mass_kg_per_m3"),
    relativeDensity: real("relative_density"),
    absorptionPercent: real("absorption_percent"),
    /** Admixtures: mL per 100 kg of cementitious material. */
    dosageMlPer100Kg: real("dosage_ml_per_100kg"),
    /** Fibers: percent of concrete volume. */
    volumeFractionPercent: real("volume_fraction_percent"),
    fiberDensityKgPerM3: real("fiber_density_kg_per_m3"),
    airContentPercent: real("air_content_percent"),
    sortOrder: integer("sort_order").notNull().default(0),
  },
  (t) => [index("mixture_constituents_material").on(t.materialId)],
);

export const enrollments = sqliteTable(
  "enrollments",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    studyId: studyIdColumn(),
    labId: labIdColumn(),
    /** Blind code such as `L07`, drawn at random on acceptance, unique within the study. */
    labCode: text("lab_code"),
    state: text("state", { enum: ENROLLMENT_STATES }).notNull().default("invited"),
    invitedAt: integer("invited_at", { mode: "timestamp_ms" }),
    respondedAt: integer("responded_at", { mode: "timestamp_ms" }),
    /** The lab's usable mixer capacity, m³, as last entered on a batch sheet: a batch larger than it is split into equal mixes. */
    mixerCapacityM3: real("mixer_capacity_m3"),
    createdAt: createdAt(),
  },
  (t) => [
    uniqueIndex("enrollments_study_lab").on(t.studyId, t.labId),
    uniqueIndex("enrollments_study_code").on(t.studyId, t.labCode),
    index("enrollments_lab").on(t.labId),
  ],
);

export const invitations = sqliteTable(
  "invitations",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    enrollmentId: enrollmentIdColumn(),
    email: text("email").notNull(),
    /** SHA-256 of the token; the token itself exists only in the e-mail. */
    tokenHash: text("token_hash").notNull().unique(),
    expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
    usedAt: integer("used_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
);

export const shipments = sqliteTable(
  "shipments",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    enrollmentId: enrollmentIdColumn(),
    status: text("status", { enum: SHIPMENT_STATUSES }).notNull().default("preparing"),
    /** Anything the items do not say; shipments from before the itemised list keep their free-text contents here. */
    note: text("note").notNull().default(""),
    carrier: text("carrier").notNull().default(""),
    trackingNumber: text("tracking_number").notNull().default(""),
    shippedOn: text("shipped_on"),
    receivedOn: text("received_on"),
    condition: text("condition", { enum: ["good", "damaged"] }),
    receiptNotes: text("receipt_notes").notNull().default(""),
    photoAttachmentId: integer("photo_attachment_id").references(() => attachments.id),
    createdAt: createdAt(),
  },
  (t) => [index("shipments_enrollment").on(t.enrollmentId)],
);

/** One line of a shipment's packing list: a material or constituent, how much, its lot and how many containers. */
export const shipmentItems = sqliteTable(
  "shipment_items",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    shipmentId: ownedBy("shipment_id", () => shipments.id),
    sortOrder: integer("sort_order").notNull().default(0),
    description: text("description").notNull(),
    quantity: real("quantity").notNull(),
    unit: text("unit", { enum: SHIPMENT_UNITS }).notNull(),
    lot: text("lot").notNull().default(""),
    containerCount: integer("container_count").notNull().default(1),
  },
  (t) => [index("shipment_items_shipment").on(t.shipmentId)],
);

/** One batch of a material mixed by a lab, with its fresh properties (SI units). */
export const batches = sqliteTable(
  "batches",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    enrollmentId: enrollmentIdColumn(),
    materialId: materialIdColumn(),
    batchVolumeM3: real("batch_volume_m3"),
    /** JSON: { [constituentId]: moisture content % of oven-dry mass }. */
    aggregateMoisture: text("aggregate_moisture", { mode: "json" }).$type<Record<string, number>>(),
    batchedAt: text("batched_at"),
    slumpMm: real("slump_mm"),
    airContentPercent: real("air_content_percent"),
    unitWeightKgPerM3: real("unit_weight_kg_per_m3"),
    concreteTemperatureC: real("concrete_temperature_c"),
    ambientTemperatureC: real("ambient_temperature_c"),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("batches_enrollment_material").on(t.enrollmentId, t.materialId)],
);

/** One lab × one material × one response. */
export const cells = sqliteTable(
  "cells",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    enrollmentId: enrollmentIdColumn(),
    ...groupColumns(),
    status: text("status", { enum: CELL_STATUSES }).notNull().default("draft"),
    submittedAt: integer("submitted_at", { mode: "timestamp_ms" }),
    submittedBy: integer("submitted_by").references(() => users.id),
    /** Optimistic concurrency: every write checks and bumps it. */
    version: integer("version").notNull().default(0),
    amended: integer("amended", { mode: "boolean" }).notNull().default(false),
  },
  (t) => [
    uniqueIndex("cells_enrollment_material_response").on(t.enrollmentId, t.materialId, t.responseId),
    index("cells_material").on(t.materialId),
  ],
);

export const results = sqliteTable(
  "results",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    cellId: ownedBy("cell_id", () => cells.id),
    replicate: integer("replicate").notNull(),
    value: real("value").notNull(),
    testedOn: text("tested_on"),
    operator: text("operator").notNull().default(""),
    photoAttachmentId: integer("photo_attachment_id").references(() => attachments.id),
    /** Goes up with every write of this replicate; a draft save names the version it read, so two people never erase each other. */
    version: integer("version").notNull().default(1),
    updatedBy: integer("updated_by").references(() => users.id),
    updatedAt: integer("updated_at", { mode: "timestamp_ms" }),
  },
  (t) => [uniqueIndex("results_cell_replicate").on(t.cellId, t.replicate)],
);

/** A change of a submitted result; the reason is required. */
export const amendments = sqliteTable(
  "amendments",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    cellId: ownedBy("cell_id", () => cells.id),
    replicate: integer("replicate").notNull(),
    oldValue: real("old_value"),
    newValue: real("new_value").notNull(),
    reason: text("reason").notNull(),
    /** The correction query the amendment answers, when it came after testing. */
    queryId: integer("query_id").references(() => queries.id),
    byUserId: personColumn("by_user_id"),
    createdAt: createdAt(),
  },
  (t) => [index("amendments_cell").on(t.cellId)],
);

/**
 * Append-only record of submissions, amendments, imports, decisions and
 * sign-in events. Triggers in the migrations refuse UPDATE and DELETE.
 */
export const auditEvents = sqliteTable(
  "audit_events",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    actorUserId: integer("actor_user_id"),
    action: text("action").notNull(),
    entityType: text("entity_type").notNull(),
    entityId: text("entity_id"),
    studyId: integer("study_id"),
    before: text("before", { mode: "json" }),
    after: text("after", { mode: "json" }),
    reason: text("reason"),
    createdAt: createdAt(),
  },
  (t) => [index("audit_events_study").on(t.studyId, t.createdAt)],
);

export const queries = sqliteTable(
  "queries",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    cellId: ownedBy("cell_id", () => cells.id),
    raisedBy: personColumn("raised_by"),
    /** The statistic that prompted it, e.g. `h = 2.41 (critical 2.06)`. */
    statistic: text("statistic").notNull().default(""),
    question: text("question").notNull(),
    /** The coordinator asks the lab to correct the cell; the lab may amend it while the query is not closed, even after testing. */
    asksCorrection: integer("asks_correction", { mode: "boolean" }).notNull().default(false),
    state: text("state", { enum: QUERY_STATES }).notNull().default("open"),
    answer: text("answer"),
    answeredBy: integer("answered_by").references(() => users.id),
    answeredAt: integer("answered_at", { mode: "timestamp_ms" }),
    closedAt: integer("closed_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (t) => [index("queries_cell").on(t.cellId)],
);

export const cellDecisions = sqliteTable(
  "cell_decisions",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    cellId: ownedBy("cell_id", () => cells.id).unique(),
    decision: text("decision", { enum: ["retained", "excluded"] }).notNull(),
    reason: text("reason").notNull(),
    decidedBy: personColumn("decided_by"),
    decidedAt: integer("decided_at", { mode: "timestamp_ms" }).notNull(),
  },
);

export const precisionStatements = sqliteTable(
  "precision_statements",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    studyId: studyIdColumn(),
    version: integer("version").notNull(),
    state: text("state", { enum: STATEMENT_STATES }).notNull().default("draft"),
    /** Statement text in the E691 form (r and R). */
    textE691: text("text_e691").notNull(),
    /** Statement text in the C670 form (1s and d2s). */
    textC670: text("text_c670").notNull(),
    /** Frozen figures, decisions and data version this text is tied to. */
    snapshot: text("snapshot", { mode: "json" }).notNull(),
    dataVersion: integer("data_version").notNull(),
    createdBy: personColumn("created_by"),
    sentAt: integer("sent_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("precision_statements_study_version").on(t.studyId, t.version)],
);

export const votes = sqliteTable(
  "votes",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    statementId: ownedBy("statement_id", () => precisionStatements.id),
    reviewerId: personColumn("reviewer_id"),
    choice: text("choice", { enum: VOTE_CHOICES }).notNull(),
    reason: text("reason"),
    /** The coordinator's answer to an objection. */
    answer: text("answer", { enum: ["upheld", "not_upheld"] }),
    answerRationale: text("answer_rationale"),
    answeredBy: integer("answered_by").references(() => users.id),
    answeredAt: integer("answered_at", { mode: "timestamp_ms" }),
    /** The objector's reply to a "not upheld" answer: withdraw the objection or maintain it. */
    objectorReply: text("objector_reply", { enum: ["withdrawn", "maintained"] }),
    objectorReplyNote: text("objector_reply_note"),
    objectorRepliedAt: integer("objector_replied_at", { mode: "timestamp_ms" }),
    /** The round chair's ruling on a maintained objection, with its reason. */
    ruling: text("ruling", { enum: ["upheld", "not_upheld"] }),
    rulingReason: text("ruling_reason"),
    ruledBy: integer("ruled_by").references(() => users.id),
    ruledAt: integer("ruled_at", { mode: "timestamp_ms" }),
    updatedAt: integer("updated_at", { mode: "timestamp_ms" }).notNull(),
  },
  (t) => [uniqueIndex("votes_statement_reviewer").on(t.statementId, t.reviewerId)],
);

/**
 * One committee round: a statement version sent for review, with its chair.
 * Its reviewers are fixed when it opens (round_reviewers), so removing a
 * reviewer from the study later changes nothing about the round.
 */
export const reviewRounds = sqliteTable("review_rounds", {
  id: integer("id").primaryKey({ autoIncrement: true }),
  statementId: ownedBy("statement_id", () => precisionStatements.id).unique(),
  /** Rules on objections that their reviewer maintains after a "not upheld" answer. */
  chairId: personColumn("chair_id"),
  openedBy: personColumn("opened_by"),
  outcome: text("outcome", { enum: ["open", "published", "returned", "cancelled"] }).notNull().default("open"),
  closedAt: integer("closed_at", { mode: "timestamp_ms" }),
  createdAt: createdAt(),
});

export const roundReviewers = sqliteTable(
  "round_reviewers",
  {
    roundId: ownedBy("round_id", () => reviewRounds.id),
    userId: personColumn("user_id"),
  },
  (t) => [primaryKey({ columns: [t.roundId, t.userId] })],
);

export const reviewComments = sqliteTable(
  "review_comments",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    statementId: ownedBy("statement_id", () => precisionStatements.id),
    authorId: personColumn("author_id"),
    body: text("body").notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("review_comments_statement").on(t.statementId)],
);

/** Every e-mail the product sends; with the fake transport this is also the mailbox. */
export const emailOutbox = sqliteTable("email_outbox", {
  id: integer("id").primaryKey({ autoIncrement: true }),
  to: text("to").notNull(),
  subject: text("subject").notNull(),
  html: text("html").notNull(),
  text: text("text").notNull(),
  transport: text("transport", { enum: ["fake", "resend"] }).notNull(),
  /** The study the message is about, so the local mailbox shows a coordinator only their studies' mail. */
  studyId: integer("study_id").references(() => studies.id, { onDelete: "set null" }),
  providerMessageId: text("provider_message_id"),
  error: text("error"),
  createdAt: createdAt(),
});

/**
 * Each scheduled e-mail, claimed before it is sent: the unique key (kind,
 * subject, recipient) makes a second claim fail, so however many app instances
 * run the schedule, a notice goes out once.
 */
export const notices = sqliteTable(
  "notices",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    kind: text("kind", { enum: NOTICE_KINDS }).notNull(),
    studyId: studyIdColumn(),
    /** The shipment or enrollment the notice is about. */
    subjectId: integer("subject_id").notNull(),
    recipient: text("recipient").notNull(),
    uniqueKey: text("unique_key").notNull().unique(),
    emailId: integer("email_id").references(() => emailOutbox.id, { onDelete: "set null" }),
    createdAt: createdAt(),
  },
  (t) => [index("notices_study").on(t.studyId)],
);

/** Which optional notices a person receives; no row means all of them. */
export const noticePreferences = sqliteTable("notice_preferences", {
  userId: userIdColumn().primaryKey(),
  resultReminders: integer("result_reminders", { mode: "boolean" }).notNull().default(true),
  enrollmentAnswers: integer("enrollment_answers", { mode: "boolean" }).notNull().default(true),
});

/** Uploaded files, stored under data/uploads by content hash. */
export const attachments = sqliteTable("attachments", {
  id: integer("id").primaryKey({ autoIncrement: true }),
  sha256: text("sha256").notNull(),
  contentType: text("content_type").notNull(),
  sizeBytes: integer("size_bytes").notNull(),
  originalName: text("original_name").notNull(),
  /** A small JPEG of an image (its hash under data/uploads), for the pages; null for PDFs. */
  thumbnailSha256: text("thumbnail_sha256"),
  uploadedBy: personColumn("uploaded_by"),
  createdAt: createdAt(),
});

export const sessions = sqliteTable(
  "sessions",
  {
    /** Random 256-bit id; the cookie carries only this. */
    id: text("id").primaryKey(),
    userId: integer("user_id").references(() => users.id, { onDelete: "cascade" }),
    data: text("data", { mode: "json" }).notNull().$type<Record<string, unknown>>(),
    expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("sessions_user").on(t.userId)],
);

export const apiTokens = sqliteTable(
  "api_tokens",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    userId: userIdColumn(),
    name: text("name").notNull(),
    tokenHash: text("token_hash").notNull().unique(),
    scope: text("scope", { enum: API_SCOPES }).notNull(),
    enrollmentId: integer("enrollment_id").references(() => enrollments.id, { onDelete: "cascade" }),
    studyId: integer("study_id").references(() => studies.id, { onDelete: "cascade" }),
    lastUsedAt: integer("last_used_at", { mode: "timestamp_ms" }),
    revokedAt: integer("revoked_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (t) => [index("api_tokens_user").on(t.userId)],
);

/**
 * Counters of the rate limits (sign-in failures, unknown links, API calls),
 * in rate-limiter-flexible's Drizzle layout: one row per limit and key, kept
 * in the database so every app instance counts together.
 */
export const rateLimits = sqliteTable("rate_limits", {
  key: text("key").primaryKey(),
  points: integer("points").notNull(),
  expire: integer("expire", { mode: "timestamp_ms" }),
});

/** The one-time link that creates the first administrator of a database with no accounts (only its hash is kept). */
export const setupLinks = sqliteTable("setup_links", {
  id: integer("id").primaryKey({ autoIncrement: true }),
  tokenHash: text("token_hash").notNull().unique(),
  expiresAt: integer("expires_at", { mode: "timestamp_ms" }).notNull(),
  usedAt: integer("used_at", { mode: "timestamp_ms" }),
  createdAt: createdAt(),
});


/**
 * A ruggedness study's plan (a study of kind "ruggedness", ASTM E1169): the
 * two-level design's size, how many results each run takes, and the run
 * order drawn from a seed. Fixed once the first result is entered.
 */
export const ruggednessPlans = sqliteTable("ruggedness_plans", {
  studyId: studyIdColumn().primaryKey(),
  runs: integer("runs").notNull(),
  replicates: integer("replicates").notNull(),
  runOrderSeed: integer("run_order_seed").notNull(),
  /** Design row numbers (1-based) in the order the runs are performed. */
  runOrder: text("run_order", { mode: "json" }).notNull().$type<number[]>(),
  createdAt: createdAt(),
});

/** One factor of a ruggedness study: its design column and its low and high settings (text, as the method words them). */
export const ruggednessFactors = sqliteTable(
  "ruggedness_factors",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    studyId: studyIdColumn(),
    column: integer("column").notNull(),
    name: text("name").notNull(),
    unit: text("unit").notNull().default(""),
    low: text("low").notNull(),
    high: text("high").notNull(),
  },
  (t) => [uniqueIndex("ruggedness_factors_study_column").on(t.studyId, t.column)],
);

/** One result of one run of a ruggedness study, per response and replicate. */
export const ruggednessResults = sqliteTable(
  "ruggedness_results",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    studyId: studyIdColumn(),
    /** design row number, 1-based */
    run: integer("run").notNull(),
    responseId: ownedBy("response_id", () => responses.id),
    replicate: integer("replicate").notNull(),
    value: real("value").notNull(),
    enteredBy: personColumn("entered_by"),
    updatedAt: integer("updated_at", { mode: "timestamp_ms" }).notNull(),
  },
  (t) => [uniqueIndex("ruggedness_results_run_response_replicate").on(t.studyId, t.run, t.responseId, t.replicate)],
);

/**
 * A person's comparison of two mixtures against a published precision
 * statement (ISO 5725-6). Kept as entered with its outcome frozen, so the
 * history shows what was concluded with the statement version used.
 */
export const comparisons = sqliteTable(
  "comparisons",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    userId: userIdColumn(),
    statementId: integer("statement_id")
      .notNull()
      .references(() => precisionStatements.id),
    /** response key in the statement */
    response: text("response").notNull(),
    setting: text("setting", { enum: COMPARISON_SETTINGS }).notNull(),
    referenceLabel: text("reference_label").notNull(),
    trialLabel: text("trial_label").notNull(),
    referenceValues: text("reference_values", { mode: "json" }).notNull().$type<number[]>(),
    trialValues: text("trial_values", { mode: "json" }).notNull().$type<number[]>(),
    notes: text("notes").notNull().default(""),
    /** the computed comparison and acceptability checks as shown when it was made */
    outcome: text("outcome", { mode: "json" }).notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("comparisons_user").on(t.userId, t.createdAt)],
);

/**
 * A proficiency round's settings (a study of kind "proficiency"): the
 * published study it was set up from and that study's precision figures,
 * copied when the round was created so later changes elsewhere cannot move
 * a round's σ_pt.
 */
export const roundSettings = sqliteTable("round_settings", {
  studyId: studyIdColumn().primaryKey(),
  sourceStudyId: integer("source_study_id").references(() => studies.id),
  /** JSON: the source study's code and its approved statement's frozen analysis (null without a source study). */
  precision: text("precision", { mode: "json" }).notNull(),
  /** JSON: the figures and every lab's scores as published; never changed afterwards. */
  publishedReport: text("published_report", { mode: "json" }),
  publishedAt: integer("published_at", { mode: "timestamp_ms" }),
  publishedBy: integer("published_by").references(() => users.id),
});

/** The coordinator's choice of assigned value and σ_pt for one material × response of a round. */
export const roundAssignments = sqliteTable(
  "round_assignments",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    studyId: studyIdColumn(),
    ...groupColumns(),
    assignedMethod: text("assigned_method", { enum: ASSIGNED_VALUE_METHODS }).notNull().default("consensus"),
    referenceValue: real("reference_value"),
    referenceUncertainty: real("reference_uncertainty"),
    sigmaMethod: text("sigma_method", { enum: SIGMA_PT_METHODS }).notNull().default("precision"),
    fixedSigma: real("fixed_sigma"),
    /** Why scores may be published although the homogeneity or stability check fails. */
    checkJustification: text("check_justification").notNull().default(""),
    updatedBy: integer("updated_by").references(() => users.id),
    updatedAt: integer("updated_at", { mode: "timestamp_ms" }),
  },
  (t) => [uniqueIndex("round_assignments_group").on(t.studyId, t.materialId, t.responseId)],
);

/** Homogeneity (two replicates per sample, before shipping) and stability (after the testing period) results of a round's material. */
export const roundCheckResults = sqliteTable(
  "round_check_results",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    studyId: studyIdColumn(),
    ...groupColumns(),
    check: text("check", { enum: MATERIAL_CHECKS }).notNull(),
    sample: integer("sample").notNull(),
    replicate: integer("replicate").notNull(),
    value: real("value").notNull(),
  },
  (t) => [uniqueIndex("round_check_results_value").on(t.materialId, t.responseId, t.check, t.sample, t.replicate)],
);

/** A lab's own standard uncertainty for its result, when it reports one (for ζ). */
export const roundLabUncertainties = sqliteTable(
  "round_lab_uncertainties",
  {
    enrollmentId: enrollmentIdColumn(),
    ...groupColumns(),
    standardUncertainty: real("standard_uncertainty").notNull(),
  },
  (t) => [primaryKey({ columns: [t.enrollmentId, t.materialId, t.responseId] })],
);

/** Every lab's scores as published, one row per lab × material × response; the lab's history across rounds reads these. */
export const roundScores = sqliteTable(
  "round_scores",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    studyId: studyIdColumn(),
    labId: labIdColumn(),
    labCode: text("lab_code").notNull(),
    materialCode: text("material_code").notNull(),
    responseKey: text("response_key").notNull(),
    result: real("result").notNull(),
    scoreKind: text("score_kind", { enum: ["z", "z′"] }).notNull(),
    score: real("score").notNull(),
    zeta: real("zeta"),
    verdict: text("verdict", { enum: SCORE_VERDICTS }).notNull(),
    publishedAt: integer("published_at", { mode: "timestamp_ms" }).notNull(),
  },
  (t) => [index("round_scores_lab").on(t.labId, t.publishedAt), index("round_scores_study").on(t.studyId)],
);
