/**
 * The whole Ringbatch data model in one place (vocabulary of the product design:
 * study, response, material, lab, enrollment, shipment, cell, result, query,
 * cell decision, precision statement, vote). drizzle-kit generates the
 * migrations in drizzle/ from this file.
 */
import { sql } from "drizzle-orm";
import {
  index,
  integer,
  primaryKey,
  real,
  sqliteTable,
  text,
  uniqueIndex,
} from "drizzle-orm/sqlite-core";
import { ROLES, STUDY_KINDS, STUDY_STATES, RESPONSE_KINDS, FRESH_PROPERTIES, CONSTITUENT_KINDS, ENROLLMENT_STATES, SHIPMENT_STATUSES, CELL_STATUSES, QUERY_STATES, STATEMENT_STATES, VOTE_CHOICES, API_SCOPES } from "./values";

export * from "./values";

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

export const labs = sqliteTable("labs", {
  id: integer("id").primaryKey({ autoIncrement: true }),
  name: text("name").notNull().unique(),
  address: text("address").notNull().default(""),
  contactName: text("contact_name").notNull().default(""),
  contactEmail: text("contact_email").notNull().default(""),
  accreditationNumber: text("accreditation_number").notNull().default(""),
  createdAt: createdAt(),
});

export const labMembers = sqliteTable(
  "lab_members",
  {
    labId: integer("lab_id")
      .notNull()
      .references(() => labs.id, { onDelete: "cascade" }),
    userId: integer("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
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
    userId: integer("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
    tokenHash: text("token_hash").notNull().unique(),
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
  enrollmentDeadline: text("enrollment_deadline"),
  shipDate: text("ship_date"),
  resultsDue: text("results_due"),
  ownerId: integer("owner_id")
    .notNull()
    .references(() => users.id),
  protocolAttachmentId: integer("protocol_attachment_id").references(() => attachments.id),
  /** Bumped on every change of results or decisions; analyses are cached by it. */
  dataVersion: integer("data_version").notNull().default(0),
  createdAt: createdAt(),
});

export const studyCoordinators = sqliteTable(
  "study_coordinators",
  {
    studyId: integer("study_id")
      .notNull()
      .references(() => studies.id, { onDelete: "cascade" }),
    userId: integer("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
  },
  (t) => [primaryKey({ columns: [t.studyId, t.userId] }), index("study_coordinators_user").on(t.userId)],
);

export const studyReviewers = sqliteTable(
  "study_reviewers",
  {
    studyId: integer("study_id")
      .notNull()
      .references(() => studies.id, { onDelete: "cascade" }),
    userId: integer("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
  },
  (t) => [primaryKey({ columns: [t.studyId, t.userId] }), index("study_reviewers_user").on(t.userId)],
);

export const responses = sqliteTable(
  "responses",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    studyId: integer("study_id")
      .notNull()
      .references(() => studies.id, { onDelete: "cascade" }),
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
    studyId: integer("study_id")
      .notNull()
      .references(() => studies.id, { onDelete: "cascade" }),
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
    studyId: integer("study_id")
      .notNull()
      .references(() => studies.id, { onDelete: "cascade" }),
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
    materialId: integer("material_id")
      .notNull()
      .references(() => materials.id, { onDelete: "cascade" }),
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
    studyId: integer("study_id")
      .notNull()
      .references(() => studies.id, { onDelete: "cascade" }),
    labId: integer("lab_id")
      .notNull()
      .references(() => labs.id),
    /** Blind code such as `L07`, drawn at random on acceptance, unique within the study. */
    labCode: text("lab_code"),
    state: text("state", { enum: ENROLLMENT_STATES }).notNull().default("invited"),
    invitedAt: integer("invited_at", { mode: "timestamp_ms" }),
    respondedAt: integer("responded_at", { mode: "timestamp_ms" }),
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
    enrollmentId: integer("enrollment_id")
      .notNull()
      .references(() => enrollments.id, { onDelete: "cascade" }),
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
    enrollmentId: integer("enrollment_id")
      .notNull()
      .references(() => enrollments.id, { onDelete: "cascade" }),
    status: text("status", { enum: SHIPMENT_STATUSES }).notNull().default("preparing"),
    contents: text("contents").notNull().default(""),
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

/** One batch of a material mixed by a lab, with its fresh properties (SI units). */
export const batches = sqliteTable(
  "batches",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    enrollmentId: integer("enrollment_id")
      .notNull()
      .references(() => enrollments.id, { onDelete: "cascade" }),
    materialId: integer("material_id")
      .notNull()
      .references(() => materials.id, { onDelete: "cascade" }),
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
    enrollmentId: integer("enrollment_id")
      .notNull()
      .references(() => enrollments.id, { onDelete: "cascade" }),
    materialId: integer("material_id")
      .notNull()
      .references(() => materials.id, { onDelete: "cascade" }),
    responseId: integer("response_id")
      .notNull()
      .references(() => responses.id, { onDelete: "cascade" }),
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
    cellId: integer("cell_id")
      .notNull()
      .references(() => cells.id, { onDelete: "cascade" }),
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
    cellId: integer("cell_id")
      .notNull()
      .references(() => cells.id, { onDelete: "cascade" }),
    replicate: integer("replicate").notNull(),
    oldValue: real("old_value"),
    newValue: real("new_value").notNull(),
    reason: text("reason").notNull(),
    /** The correction query the amendment answers, when it came after testing. */
    queryId: integer("query_id").references(() => queries.id),
    byUserId: integer("by_user_id")
      .notNull()
      .references(() => users.id),
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
    cellId: integer("cell_id")
      .notNull()
      .references(() => cells.id, { onDelete: "cascade" }),
    raisedBy: integer("raised_by")
      .notNull()
      .references(() => users.id),
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
    cellId: integer("cell_id")
      .notNull()
      .unique()
      .references(() => cells.id, { onDelete: "cascade" }),
    decision: text("decision", { enum: ["retained", "excluded"] }).notNull(),
    reason: text("reason").notNull(),
    decidedBy: integer("decided_by")
      .notNull()
      .references(() => users.id),
    decidedAt: integer("decided_at", { mode: "timestamp_ms" }).notNull(),
  },
);

export const precisionStatements = sqliteTable(
  "precision_statements",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    studyId: integer("study_id")
      .notNull()
      .references(() => studies.id, { onDelete: "cascade" }),
    version: integer("version").notNull(),
    state: text("state", { enum: STATEMENT_STATES }).notNull().default("draft"),
    /** Statement text in the E691 form (r and R). */
    textE691: text("text_e691").notNull(),
    /** Statement text in the C670 form (1s and d2s). */
    textC670: text("text_c670").notNull(),
    /** Frozen figures, decisions and data version this text is tied to. */
    snapshot: text("snapshot", { mode: "json" }).notNull(),
    dataVersion: integer("data_version").notNull(),
    createdBy: integer("created_by")
      .notNull()
      .references(() => users.id),
    sentAt: integer("sent_at", { mode: "timestamp_ms" }),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("precision_statements_study_version").on(t.studyId, t.version)],
);

export const votes = sqliteTable(
  "votes",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    statementId: integer("statement_id")
      .notNull()
      .references(() => precisionStatements.id, { onDelete: "cascade" }),
    reviewerId: integer("reviewer_id")
      .notNull()
      .references(() => users.id),
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
  statementId: integer("statement_id")
    .notNull()
    .unique()
    .references(() => precisionStatements.id, { onDelete: "cascade" }),
  /** Rules on objections that their reviewer maintains after a "not upheld" answer. */
  chairId: integer("chair_id")
    .notNull()
    .references(() => users.id),
  openedBy: integer("opened_by")
    .notNull()
    .references(() => users.id),
  outcome: text("outcome", { enum: ["open", "published", "returned", "cancelled"] }).notNull().default("open"),
  closedAt: integer("closed_at", { mode: "timestamp_ms" }),
  createdAt: createdAt(),
});

export const roundReviewers = sqliteTable(
  "round_reviewers",
  {
    roundId: integer("round_id")
      .notNull()
      .references(() => reviewRounds.id, { onDelete: "cascade" }),
    userId: integer("user_id")
      .notNull()
      .references(() => users.id),
  },
  (t) => [primaryKey({ columns: [t.roundId, t.userId] })],
);

export const reviewComments = sqliteTable(
  "review_comments",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    statementId: integer("statement_id")
      .notNull()
      .references(() => precisionStatements.id, { onDelete: "cascade" }),
    authorId: integer("author_id")
      .notNull()
      .references(() => users.id),
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
  providerMessageId: text("provider_message_id"),
  error: text("error"),
  createdAt: createdAt(),
});

/** Uploaded files, stored under data/uploads by content hash. */
export const attachments = sqliteTable("attachments", {
  id: integer("id").primaryKey({ autoIncrement: true }),
  sha256: text("sha256").notNull(),
  contentType: text("content_type").notNull(),
  sizeBytes: integer("size_bytes").notNull(),
  originalName: text("original_name").notNull(),
  uploadedBy: integer("uploaded_by")
    .notNull()
    .references(() => users.id),
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
    userId: integer("user_id")
      .notNull()
      .references(() => users.id, { onDelete: "cascade" }),
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

/** Hits counted by the rate limiter (sign-in failures, invitation use, API calls). */
export const rateLimitHits = sqliteTable(
  "rate_limit_hits",
  {
    id: integer("id").primaryKey({ autoIncrement: true }),
    bucket: text("bucket").notNull(),
    key: text("key").notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("rate_limit_hits_bucket_key").on(t.bucket, t.key, t.createdAt)],
);
