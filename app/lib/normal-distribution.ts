/**
 * The standard normal distribution from jstat 1.9.6, typed here: the
 * package ships no types, and app/lib/precision/jstat.d.ts declares only the
 * t and F parts that engine uses.
 */
import jStat from "jstat";

type Normal = {
  cdf(x: number, mean: number, sd: number): number;
  pdf(x: number, mean: number, sd: number): number;
  inv(probability: number, mean: number, sd: number): number;
};

const normal = (jStat as unknown as { normal: Normal }).normal;

export const standardNormalCdf = (z: number) => normal.cdf(z, 0, 1);
export const standardNormalDensity = (z: number) => normal.pdf(z, 0, 1);
export const standardNormalQuantile = (p: number) => normal.inv(p, 0, 1);
