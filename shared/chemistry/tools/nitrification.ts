/**
 * Alkalinity budget of nitrification and denitrification. Nitrification consumes 2 mol HCO3−
 * per mol NH4+-N: 2 × 50.04/14.007 = 7.145, quoted as 7.14 mg as CaCO3 per mg NH4-N;
 * denitrification returns half, 3.57 per mg NO3-N [EPA Nitrogen Control Manual EPA/625/R-93/010
 * (1993), from memory; stoichiometry computed here]. The published 7.14 and 3.57 are used so
 * that results match operator worksheets.
 */

/** mg alkalinity as CaCO3 consumed per mg NH4-N nitrified [EPA 1993, from memory]. */
export const ALKALINITY_PER_NH4N_NITRIFIED = 7.14;
/** mg alkalinity as CaCO3 recovered per mg NO3-N denitrified [EPA 1993, from memory]. */
export const ALKALINITY_PER_NO3N_DENITRIFIED = 3.57;
/**
 * Default minimum residual alkalinity in nitrifying activated sludge, mg/L as CaCO3: about 50
 * keeps the pH above about 6.8–7 (some guidance uses 40; 50–70 is often quoted) [common
 * practice; Metcalf & Eddy, from memory].
 */
export const DEFAULT_RESIDUAL_ALKALINITY_MGL = 50;

export interface NitrificationBudget {
  consumedMgL: number;
  recoveredMgL: number;
  /** Influent − consumed + recovered; negative means the alkalinity runs out. */
  residualMgL: number;
  targetResidualMgL: number;
  /** max(0, target − residual): alkalinity to add. */
  shortfallMgL: number;
  meetsTarget: boolean;
}

/** Residual alkalinity = influent − 7.14 × NH4-N nitrified + 3.57 × NO3-N denitrified, against a target [EPA 1993, from memory]. */
export function nitrificationBudget(input: {
  influentAlkalinity: number;
  nitrifiedNh4NMgL: number;
  denitrifiedNo3NMgL?: number;
  targetResidualAlkalinity?: number;
}): NitrificationBudget {
  const consumedMgL = ALKALINITY_PER_NH4N_NITRIFIED * input.nitrifiedNh4NMgL;
  const recoveredMgL = ALKALINITY_PER_NO3N_DENITRIFIED * (input.denitrifiedNo3NMgL ?? 0);
  const residualMgL = input.influentAlkalinity - consumedMgL + recoveredMgL;
  const targetResidualMgL = input.targetResidualAlkalinity ?? DEFAULT_RESIDUAL_ALKALINITY_MGL;
  const shortfallMgL = Math.max(0, targetResidualMgL - residualMgL);
  return { consumedMgL, recoveredMgL, residualMgL, targetResidualMgL, shortfallMgL, meetsTarget: shortfallMgL === 0 };
}
