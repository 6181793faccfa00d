/**
 * US customary ⇄ SI conversions. Every factor is exact by definition
 * (NIST SP 811 unit definitions: international foot and pound of 1959,
 * US liquid gallon of 231 in³); derived factors are computed from these
 * rather than typed in rounded.
 */

/** 1 lb = 0.45359237 kg, exact by definition. */
export const KG_PER_LB = 0.45359237;
/** 1 in = 25.4 mm, exact by definition. */
export const MM_PER_IN = 25.4;
/** 1 ft = 12 in = 0.3048 m, exact by definition. */
export const M_PER_FT = 0.3048;
/** 1 ft³ = 0.3048³ m³ = 0.028316846592 m³, exact by definition. */
export const M3_PER_FT3 = M_PER_FT ** 3;
/** 1 yd³ = 27 ft³ = 0.764554857984 m³, exact by definition. */
export const M3_PER_YD3 = 27 * M3_PER_FT3;
/** 1 US fl oz = 1/128 US gal = 231/128 in³ = 29.5735295625 mL, exact by definition. */
export const ML_PER_US_FL_OZ = 29.5735295625;
/** 1 cwt (US hundredweight) = 100 lb = 45.359237 kg, exact by definition. */
export const KG_PER_CWT = 100 * KG_PER_LB;

/** Mass per volume: lb/yd³ → kg/m³ (× 0.45359237 / 0.764554857984 ≈ 0.593276). */
export function lbPerYd3ToKgPerM3(lbPerYd3: number): number {
  return (lbPerYd3 * KG_PER_LB) / M3_PER_YD3;
}

/** Mass per volume: kg/m³ → lb/yd³. */
export function kgPerM3ToLbPerYd3(kgPerM3: number): number {
  return (kgPerM3 * M3_PER_YD3) / KG_PER_LB;
}

/** Density: lb/ft³ → kg/m³ (× 0.45359237 / 0.028316846592 ≈ 16.0185). */
export function lbPerFt3ToKgPerM3(lbPerFt3: number): number {
  return (lbPerFt3 * KG_PER_LB) / M3_PER_FT3;
}

/** Density: kg/m³ → lb/ft³. */
export function kgPerM3ToLbPerFt3(kgPerM3: number): number {
  return (kgPerM3 * M3_PER_FT3) / KG_PER_LB;
}

/** Volume: yd³ → m³. */
export function yd3ToM3(yd3: number): number {
  return yd3 * M3_PER_YD3;
}

/** Volume: m³ → yd³. */
export function m3ToYd3(m3: number): number {
  return m3 / M3_PER_YD3;
}

/** Volume: ft³ → m³. */
export function ft3ToM3(ft3: number): number {
  return ft3 * M3_PER_FT3;
}

/** Volume: m³ → ft³. */
export function m3ToFt3(m3: number): number {
  return m3 / M3_PER_FT3;
}

/** Admixture dosage: US fl oz per cwt of cementitious → mL per 100 kg (≈ 65.198). */
export function flOzPerCwtToMlPer100kg(flOzPerCwt: number): number {
  return ((flOzPerCwt * ML_PER_US_FL_OZ) / KG_PER_CWT) * 100;
}

/** Admixture dosage: mL per 100 kg of cementitious → US fl oz per cwt. */
export function mlPer100kgToFlOzPerCwt(mlPer100kg: number): number {
  return ((mlPer100kg / 100) * KG_PER_CWT) / ML_PER_US_FL_OZ;
}

/** Length: in → mm. */
export function inToMm(inches: number): number {
  return inches * MM_PER_IN;
}

/** Length: mm → in. */
export function mmToIn(mm: number): number {
  return mm / MM_PER_IN;
}

/** Temperature: °F → °C, t_C = (t_F − 32) / 1.8, exact by definition. */
export function fahrenheitToCelsius(degF: number): number {
  return (degF - 32) / 1.8;
}

/** Temperature: °C → °F, t_F = 1.8 t_C + 32, exact by definition. */
export function celsiusToFahrenheit(degC: number): number {
  return degC * 1.8 + 32;
}
