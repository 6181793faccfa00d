/**
 * Concrete in one float finishing specimen, m³: the form is
 * 3 ft × 2 ft × 3 in = 1.5 ft³ = 0.042475 m³, taken as 0.0425 m³ (common
 * practice; the rounding is far inside the waste allowance).
 */
export const FLOAT_FINISHING_SPECIMEN_M3 = 0.0425;

/** Extra concrete for spillage and what sticks to the mixer, as a fraction (our default; the study may set its own). */
export const DEFAULT_WASTE_FRACTION = 0.1;

/** Concrete for slump, air, unit weight and temperature, m³ (our default; the study may set its own). */
export const DEFAULT_FRESH_TEST_ALLOWANCE_M3 = 0.01;

export interface BatchVolumeInput {
  specimens: number;
  specimenVolumeM3?: number;
  wasteFraction?: number;
  freshTestAllowanceM3?: number;
}

export interface BatchVolumeStep {
  /** e.g. "2 specimens × 0.0425 m³ = 0.085 m³" */
  text: string;
  valueM3: number;
}

export interface BatchVolumeSuggestion {
  volumeM3: number;
  steps: BatchVolumeStep[];
  /** The whole arithmetic on one line, e.g. "2 specimens × 0.0425 m³ × 1.10 + 0.010 m³ = 0.1035 m³". */
  summary: string;
}

/** Rounds to maxDecimals, then drops trailing zeros down to minDecimals. */
function formatNumber(x: number, maxDecimals: number, minDecimals: number): string {
  const text = x.toFixed(maxDecimals);
  const [whole, fraction] = text.split(".");
  let kept = fraction;
  while (kept.length > minDecimals && kept.endsWith("0")) kept = kept.slice(0, -1);
  return kept.length > 0 ? `${whole}.${kept}` : whole;
}

const m3 = (x: number) => `${formatNumber(x, 4, 3)} m³`;

/**
 * Suggested batch volume V = specimens × specimen volume × (1 + waste)
 * + fresh-test allowance (common practice), with the arithmetic spelled out.
 */
export function suggestBatchVolume(input: BatchVolumeInput): BatchVolumeSuggestion {
  const {
    specimens,
    specimenVolumeM3 = FLOAT_FINISHING_SPECIMEN_M3,
    wasteFraction = DEFAULT_WASTE_FRACTION,
    freshTestAllowanceM3 = DEFAULT_FRESH_TEST_ALLOWANCE_M3,
  } = input;
  if (!(Number.isInteger(specimens) && specimens >= 1)) {
    throw new RangeError("Number of specimens must be a whole number of at least 1");
  }
  if (!(specimenVolumeM3 > 0) || !(wasteFraction >= 0) || !(freshTestAllowanceM3 >= 0)) {
    throw new RangeError("Specimen volume must be positive; waste and allowance at least 0");
  }
  const specimenText = `${specimens} specimen${specimens === 1 ? "" : "s"} × ${m3(specimenVolumeM3)}`;
  const factorText = formatNumber(1 + wasteFraction, 3, 2);
  const forSpecimens = specimens * specimenVolumeM3;
  const withWaste = forSpecimens * (1 + wasteFraction);
  const total = withWaste + freshTestAllowanceM3;
  return {
    volumeM3: total,
    steps: [
      { text: `${specimenText} = ${m3(forSpecimens)}`, valueM3: forSpecimens },
      {
        text: `${m3(forSpecimens)} × ${factorText} (${formatNumber(wasteFraction * 100, 1, 0)} % waste) = ${m3(withWaste)}`,
        valueM3: withWaste,
      },
      {
        text: `${m3(withWaste)} + ${m3(freshTestAllowanceM3)} (fresh tests) = ${m3(total)}`,
        valueM3: total,
      },
    ],
    summary: `${specimenText} × ${factorText} + ${m3(freshTestAllowanceM3)} = ${m3(total)}`,
  };
}
