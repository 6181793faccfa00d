/**
 * The analysis page's tables for download: per material × response the
 * precision figures, and per lab its cell statistics and flags. Labs appear
 * by code only, so the same tables serve coordinators and reviewers.
 */
import type { ComputedGroup, GroupResult, LabResult, StudyAnalysis } from "~/lib/precision";
import { labClasses } from "~/lib/review/flags";
import { type ExportColumn, exportTable } from "./table";

type GroupRow = { group: GroupResult };
type LabRow = GroupRow & { lab: LabResult };

/** The fields of a computed group that hold one figure. */
type Figure = { [K in keyof ComputedGroup]: ComputedGroup[K] extends number | null ? K : never }[keyof ComputedGroup];

/** A precision figure of the group; blank where the group was not computed. */
const figureColumn = (field: Figure, title: string, key: string = field): ExportColumn<GroupRow> => ({
  key,
  title,
  value: ({ group }) => (group.status === "computed" ? group[field] : null),
});

const GROUP_KEYS: ExportColumn<GroupRow>[] = [
  { key: "material", title: "Material", value: ({ group }) => group.material },
  { key: "response", title: "Response", value: ({ group }) => group.response },
];

const PRECISION_COLUMNS: ExportColumn<GroupRow>[] = [
  { key: "p", title: "p (labs)", value: ({ group }) => group.p },
  { key: "n", title: "n (replicates)", value: ({ group }) => group.n },
  figureColumn("mean", "x̿", "grandMean"),
  figureColumn("sx", "s_x̄"),
  figureColumn("sr", "s_r"),
  figureColumn("sL", "s_L"),
  figureColumn("sR", "s_R"),
  figureColumn("r", "r"),
  figureColumn("R", "R"),
  figureColumn("cvr", "CV_r %"),
  figureColumn("cvR", "CV_R %"),
  figureColumn("alpha", "Significance level"),
  figureColumn("hCritical", "h critical"),
  figureColumn("kCritical", "k critical"),
  { key: "notComputed", title: "Not computed because", value: ({ group }) => (group.status === "not-computed" ? group.reasons.join("; ") : null) },
];

const LAB_COLUMNS: ExportColumn<LabRow>[] = [
  { key: "lab", title: "Lab code", value: ({ lab }) => lab.lab },
  { key: "labN", title: "Results", value: ({ lab }) => lab.n },
  { key: "mean", title: "Cell average", value: ({ lab }) => lab.mean },
  { key: "s", title: "s", value: ({ lab }) => lab.sd },
  { key: "d", title: "d", value: ({ lab }) => lab.d },
  { key: "h", title: "h", value: ({ lab }) => lab.h },
  { key: "k", title: "k", value: ({ lab }) => lab.k },
  { key: "flags", title: "Flags", value: ({ lab }) => lab.flags.join(" ") || null },
  { key: "cochran", title: "Cochran", value: ({ group, lab }) => labClasses(group, lab.lab).cochran },
  { key: "grubbs", title: "Grubbs", value: ({ group, lab }) => labClasses(group, lab.lab).grubbs },
];

const EXCLUDED_COLUMNS: ExportColumn<StudyAnalysis["excluded"][number]>[] = [
  { key: "lab", title: "Lab code", value: (cell) => cell.lab },
  { key: "material", title: "Material", value: (cell) => cell.material },
  { key: "response", title: "Response", value: (cell) => cell.response },
  { key: "reason", title: "Reason", value: (cell) => cell.reason },
  { key: "results", title: "Results left out", value: (cell) => cell.results },
];

const labRows = (analysis: StudyAnalysis): LabRow[] => analysis.groups.flatMap((group) => group.labs.map((lab) => ({ group, lab })));

/**
 * The figures as sheets: precision per material × response, the labs' cell
 * statistics, and the cells left out of both.
 */
export function analysisSheets(analysis: StudyAnalysis) {
  return [
    exportTable("Precision", [...GROUP_KEYS, ...PRECISION_COLUMNS], analysis.groups.map((group) => ({ group }))),
    exportTable("Labs", [...GROUP_KEYS, ...LAB_COLUMNS], labRows(analysis)),
    exportTable("Excluded cells", EXCLUDED_COLUMNS, analysis.excluded),
  ];
}

/**
 * The figures as one flat table, one row per material × response × lab with
 * its group's precision figures beside it: a CSV holds a single table.
 */
export function analysisFlatTable(analysis: StudyAnalysis) {
  return exportTable("Analysis", [...GROUP_KEYS, ...LAB_COLUMNS, ...PRECISION_COLUMNS], labRows(analysis));
}
