/**
 * The JSON API's schemas: path ids, query parameters, the one request body,
 * and the answers. The routes parse with them and the OpenAPI document
 * (./openapi.ts) is generated from them, so the two cannot drift apart.
 */
import { z } from "zod";
import { SIGNIFICANCE_LEVELS } from "~/lib/precision";
import { parseCellList } from "~/lib/review/cells";

/** A row id in a path (`:studyId`, `:roundId`, `:enrollmentId`). */
export const idParam = z.coerce.number().int().positive().meta({ description: "A whole number ≥ 1." });

const ALPHA_TEXT = SIGNIFICANCE_LEVELS.map(String) as [string, ...string[]];

/** `?alpha=`: the significance level of the h and k critical values; absent means the study's own. */
export const significanceQuery = z.object({
  alpha: z
    .enum(ALPHA_TEXT, { error: `alpha must be ${ALPHA_TEXT.slice(0, -1).join(", ")} or ${ALPHA_TEXT.at(-1)}.` })
    .transform(Number)
    .optional()
    .meta({ description: "Significance level of the h and k critical values: 0.005 (ASTM E691), 0.01 or 0.05 (ISO 5725-2). Absent: the study's own." }),
});

/** `?exclude=L01:M3:holes,…` besides `?alpha=`: the cells a what-if analysis leaves out. */
export const whatIfQuery = significanceQuery.extend({
  exclude: z
    .string()
    .optional()
    .transform((text, ctx) => {
      const parsed = parseCellList(text ?? null);
      if ("error" in parsed) {
        ctx.addIssue({ code: "custom", message: parsed.error });
        return z.NEVER;
      }
      return parsed.cells;
    })
    .meta({ description: "Cells to leave out, each written lab code:material code:response key, separated by commas. Empty: none." }),
});

/** `?page=`: a page of a list, from 1; anything else reads as the first page. */
export const pageQuery = z.object({
  page: z.coerce.number().int().min(1).optional().catch(undefined).meta({ description: "Page number, from 1 (100 studies a page); past the end: the last page." }),
});

/** The body of POST /api/v1/enrollments/:enrollmentId/results. Strict: a field the API does not know (a typo, `__proto__`) is refused rather than dropped. */
export const resultsBody = z.strictObject({
  results: z
    .array(
      z.strictObject({
        material: z.string().min(1).max(40).meta({ description: "Material code, e.g. F1." }),
        response: z.string().min(1).max(40).meta({ description: "Response key, e.g. holes." }),
        replicate: z.number().int(),
        value: z.number(),
        testedOn: z.string().max(20).nullish().meta({ description: "Test date, YYYY-MM-DD." }),
        operator: z.string().max(200).nullish(),
        readVersion: z
          .number()
          .int()
          .min(0)
          .optional()
          .meta({ description: "The replicate's `version` as read from GET (0: nothing stored). Given, the write is refused with 409 if the replicate has changed since." }),
      }),
    )
    .min(1, { message: "Send at least one result." })
    .max(5000, { message: "Send at most 5000 results per request." }),
});

// What the API answers. Routes that send a larger structure (the precision engine's output) document its top level.

export const apiErrorAnswer = z
  .object({ error: z.object({ code: z.string(), message: z.string(), details: z.unknown().optional() }) })
  .meta({ description: "Every failure: a machine code, a sentence for people, and sometimes details (per row or per field)." });

export const healthAnswer = z.object({ status: z.enum(["ok", "error"]), database: z.enum(["reachable", "unreachable"]) });

const pageInfo = z.object({ page: z.number().int(), pageCount: z.number().int(), total: z.number().int(), pageSize: z.number().int() });

export const studyListAnswer = z.object({
  studies: z.array(z.object({ id: z.number().int(), code: z.string(), title: z.string(), kind: z.string(), state: z.string() })),
  page: pageInfo,
});

export const roundListAnswer = z.object({
  rounds: z.array(z.object({ id: z.number().int(), code: z.string(), title: z.string(), testMethod: z.string(), state: z.string() })),
});

const nullableText = z.string().nullable();

export const resultsAnswer = z.object({
  study: z.object({ id: z.number().int(), code: z.string() }),
  results: z.array(
    z
      .object({
        lab: z.string().meta({ description: "Blind lab code." }),
        labName: z.string().optional().meta({ description: "Coordinators and admins only." }),
        material: z.string(),
        response: z.string(),
        replicate: z.number().int(),
        value: z.number(),
        testedOn: nullableText,
        operator: z.string().optional().meta({ description: "Coordinators and admins only." }),
        status: z.enum(["draft", "submitted"]).optional().meta({ description: "Coordinators and admins only; reviewers get submitted cells only." }),
        amendments: z.number().int().optional().meta({ description: "Coordinators and admins only: amendments of the cell." }),
        decision: z.enum(["retained", "excluded"]).nullable(),
        decisionReason: nullableText,
      })
      .meta({ description: "One replicate result, with its cell's status and decision." }),
  ),
});

export const importAnswer = z.object({ received: z.number().int(), changed: z.number().int() });

export const bundleSummaryAnswer = z.object({
  statementVersion: z.number().int(),
  fileName: z.string(),
  sha256: z.string(),
  bytes: z.number().int(),
  files: z.array(z.object({ name: z.string(), sha256: z.string(), bytes: z.number().int() })),
  download: z.string(),
});

/** An answer whose full shape is documented in prose: the object's top-level fields. */
export const describedObject = (description: string) => z.looseObject({}).meta({ description });
