import { inputError } from '../errors.js';
import { DEFAULT_CACO3_FACTOR } from './constants.js';
import type { Reading } from './endpoints.js';
import { activityCoefficients, carbonateConstants, type ActivityCoefficients, type CarbonateConstants } from './speciation.js';

/**
 * Titration-curve model by charge balance, closed system, with dilution:
 *   C_T' (K1 h + 2 K1 K2)/(h² + K1 h + K1 K2) + Kw/h − h − S' = 0
 * where S' is the net strong base ([Na+] − [Cl−], eq/L) after mixing, h = [H+], and, with
 * activity, K1/γ1², K2/γ2, Kw/γ1² are the concentration constants and pH = −log(γ1 h)
 * [charge balance as in Stumm and Morgan, Aquatic Chemistry; constants Plummer and Busenberg
 * 1982 and Harned and Robinson 1940]. The residual falls monotonically in h, so the pH is found
 * by bisection on log h. Ionic strength is held at the sample's value through the titration.
 */

export type Titrant = 'acid' | 'base';

export interface TitrationModel {
  sampleVolumeMl: number;
  /**
   * S0: net strong base of the sample, eq/L. For a carbonate water it equals the total
   * alkalinity; for an acid sample it is minus the mineral acidity.
   */
  strongBaseEqL: number;
  /** C_T of the sample, mol/L. */
  totalCarbonateM: number;
  titrant: Titrant;
  titrantNormality: number;
  temperatureC: number;
  activity: ActivityCoefficients;
  constants: CarbonateConstants;
  /** Concentration constants K1/γ1², K2/γ2, Kw/γ1². */
  k1: number;
  k2: number;
  kw: number;
}

export interface ModelSpec {
  sampleVolumeMl: number;
  titrant: Titrant;
  titrantNormality: number;
  temperatureC?: number;
  /** 0 or absent: ideal solution. */
  ionicStrength?: number;
}

/** Builds a model from the sample's net strong base and total carbonate [charge balance, Stumm and Morgan]. */
export function createModel(spec: ModelSpec & { strongBaseEqL: number; totalCarbonateM: number }): TitrationModel {
  const temperatureC = spec.temperatureC ?? 25;
  const constants = carbonateConstants(temperatureC);
  const activity = activityCoefficients(spec.ionicStrength ?? 0, temperatureC);
  const g1 = activity.gamma1;
  return {
    sampleVolumeMl: spec.sampleVolumeMl,
    strongBaseEqL: spec.strongBaseEqL,
    totalCarbonateM: spec.totalCarbonateM,
    titrant: spec.titrant,
    titrantNormality: spec.titrantNormality,
    temperatureC,
    activity,
    constants,
    k1: 10 ** constants.logK1 / (g1 * g1),
    k2: 10 ** constants.logK2 / activity.gamma2,
    kw: 10 ** constants.logKw / (g1 * g1),
  };
}

/** HCO3− + 2 CO3²− per mole of C_T at concentration h. */
function carbonateCharge(model: TitrationModel, h: number): number {
  const { k1, k2 } = model;
  return (k1 * h + 2 * k1 * k2) / (h * h + k1 * h + k1 * k2);
}

function concentrationH(model: TitrationModel, pH: number): number {
  return 10 ** -pH / model.activity.gamma1;
}

/** Closed carbonate water from its alkalinity and pH: C_T = (Alk − Kw/h + h)/(α1 + 2α2) [USGS NFM 6.6.5.B; SM 2330]. */
export function carbonateWaterModel(spec: ModelSpec & { initialPh: number; alkalinityEqL: number }): TitrationModel {
  const probe = createModel({ ...spec, strongBaseEqL: spec.alkalinityEqL, totalCarbonateM: 0 });
  const h = concentrationH(probe, spec.initialPh);
  const totalCarbonateM = (spec.alkalinityEqL - probe.kw / h + h) / carbonateCharge(probe, h);
  if (!(totalCarbonateM >= 0)) {
    throw inputError('totalAlkalinity', `is too low for a carbonate water at pH ${spec.initialPh}: the hydroxide alone exceeds it`);
  }
  return { ...probe, totalCarbonateM };
}

/** Carbonate sample from its pH and C_T: S0 = C_T(α1 + 2α2) + Kw/h − h [charge balance, Stumm and Morgan]. */
export function carbonateModelFromTotalCarbonate(spec: ModelSpec & { initialPh: number; totalCarbonateM: number }): TitrationModel {
  const probe = createModel({ ...spec, strongBaseEqL: 0, totalCarbonateM: spec.totalCarbonateM });
  const h = concentrationH(probe, spec.initialPh);
  return { ...probe, strongBaseEqL: spec.totalCarbonateM * carbonateCharge(probe, h) + probe.kw / h - h };
}

/** Strong acid sample, no carbonate (S0 = −C_a) [charge balance]. */
export function strongAcidModel(spec: ModelSpec & { concentrationM: number }): TitrationModel {
  return createModel({ ...spec, strongBaseEqL: -spec.concentrationM, totalCarbonateM: 0 });
}

/** Strong base sample, no carbonate (S0 = C_b) [charge balance]. */
export function strongBaseModel(spec: ModelSpec & { concentrationM: number }): TitrationModel {
  return createModel({ ...spec, strongBaseEqL: spec.concentrationM, totalCarbonateM: 0 });
}

function dilutedStrongBase(model: TitrationModel, volumeMl: number): number {
  const v0 = model.sampleVolumeMl;
  const added = model.titrantNormality * volumeMl * (model.titrant === 'acid' ? -1 : 1);
  return (model.strongBaseEqL * v0 + added) / (v0 + volumeMl);
}

const LOG_H_MIN = -16;
const LOG_H_MAX = 1;
// 17 decades halved 48 times: log h known to 6e-14, far below any pH display.
const BISECTION_STEPS = 48;

/** pH after `volumeMl` of titrant, by bisection on log[H+] of the charge balance [Stumm and Morgan; Plummer and Busenberg 1982]. */
export function modelPh(model: TitrationModel, volumeMl: number): number {
  const v0 = model.sampleVolumeMl;
  const ct = (model.totalCarbonateM * v0) / (v0 + volumeMl);
  const s = dilutedStrongBase(model, volumeMl);
  let lo = LOG_H_MIN;
  let hi = LOG_H_MAX;
  for (let i = 0; i < BISECTION_STEPS; i++) {
    const mid = (lo + hi) / 2;
    const h = 10 ** mid;
    const residual = ct * carbonateCharge(model, h) + model.kw / h - h - s;
    // Residual falls as h rises: positive means the true h is larger.
    if (residual > 0) lo = mid;
    else hi = mid;
  }
  const h = 10 ** ((lo + hi) / 2);
  return -Math.log10(model.activity.gamma1 * h);
}

/** Model curve at the given cumulative titrant volumes [charge balance, Stumm and Morgan]. */
export function modelCurve(model: TitrationModel, volumesMl: readonly number[]): Reading[] {
  return volumesMl.map((volumeMl) => ({ volumeMl, pH: modelPh(model, volumeMl) }));
}

/**
 * Titrant volume at which the model reaches `pH`, solved in closed form from the charge balance
 * (acid: V = V0 (S0 − C_T α − w)/(N + w); base: V = V0 (C_T α + w − S0)/(N − w), w = Kw/h − h)
 * [computed here from the charge balance]. Null when the sample starts beyond that pH or the
 * titrant cannot reach it.
 */
export function volumeAtPh(model: TitrationModel, pH: number): number | null {
  const h = concentrationH(model, pH);
  const w = model.kw / h - h;
  const bound = model.totalCarbonateM * carbonateCharge(model, h);
  const v0 = model.sampleVolumeMl;
  const n = model.titrantNormality;
  const [numerator, denominator] =
    model.titrant === 'acid' ? [model.strongBaseEqL - bound - w, n + w] : [bound + w - model.strongBaseEqL, n - w];
  if (!(denominator > 0)) return null;
  const volume = (v0 * numerator) / denominator;
  return volume >= 0 ? volume : null;
}

export type EquivalenceName = 'carbonate' | 'total' | 'mineral';

export interface EquivalencePoint {
  /**
   * Acid titrant: `carbonate` (NaHCO3 solution, ≈ pH 8.3, gives P) and `total` (CO2 solution,
   * ≈ pH 4.5, gives T). Base titrant: `mineral` (CO2 solution, gives mineral acidity) and
   * `total` (NaHCO3 solution, ≈ pH 8.3, gives total acidity). Without carbonate there is one
   * point, `total`.
   */
  name: EquivalenceName;
  volumeMl: number;
  pH: number;
}

/**
 * True equivalence points from stoichiometry: acid titrant V_total = S0·V0/N and V_carbonate =
 * (S0 − C_T)·V0/N; base titrant V_mineral = −S0·V0/N and V_total = (C_T − S0)·V0/N; the pH there
 * is the model's [computed here from the proton reference levels H2CO3* and HCO3−, Stumm and
 * Morgan]. Points that would fall at or before the start are omitted.
 */
export function equivalencePoints(model: TitrationModel): EquivalencePoint[] {
  const { strongBaseEqL: s0, totalCarbonateM: ct, sampleVolumeMl: v0, titrantNormality: n } = model;
  const candidates: Array<[EquivalenceName, number]> = [];
  if (ct === 0) {
    candidates.push(['total', ((model.titrant === 'acid' ? s0 : -s0) * v0) / n]);
  } else if (model.titrant === 'acid') {
    candidates.push(['carbonate', ((s0 - ct) * v0) / n], ['total', (s0 * v0) / n]);
  } else {
    candidates.push(['mineral', (-s0 * v0) / n], ['total', ((ct - s0) * v0) / n]);
  }
  return candidates
    .filter(([, volumeMl]) => volumeMl > 0)
    .map(([name, volumeMl]) => ({ name, volumeMl, pH: modelPh(model, volumeMl) }));
}

export interface EndpointError {
  endpointPh: number;
  /** Volume at which the model reaches the endpoint pH, mL. */
  endpointVolumeMl: number;
  /** The equivalence point the endpoint stands for. */
  equivalence: EquivalencePoint;
  /** Endpoint volume − equivalence volume, mL (positive: the fixed endpoint reads high). */
  errorMl: number;
  /** The same error as mg/L as CaCO3 (ΔV × N × factor / V_s). */
  errorMgL: number;
  /** The true result, mg/L as CaCO3 (V_eq × N × factor / V_s). */
  trueResultMgL: number;
  /** What the fixed endpoint would report, mg/L as CaCO3. */
  endpointResultMgL: number;
  /** errorMl as % of the equivalence volume. */
  errorPercent: number;
}

/**
 * Systematic error of a fixed endpoint pH: model volume at that pH minus the true equivalence
 * volume, in mL, mg/L as CaCO3 and % [computed here from the charge-balance model; SM 2320 B
 * factor]. The equivalence point is the one named, else the one whose pH is nearest.
 */
export function endpointError(
  model: TitrationModel,
  endpointPh: number,
  options: { factor?: number; equivalence?: EquivalenceName; field?: string } = {},
): EndpointError {
  const field = options.field ?? 'endpointPh';
  const factor = options.factor ?? DEFAULT_CACO3_FACTOR;
  const points = equivalencePoints(model);
  const chosen = options.equivalence
    ? points.find((p) => p.name === options.equivalence)
    : points.reduce<EquivalencePoint | undefined>(
        (best, p) => (best === undefined || Math.abs(p.pH - endpointPh) < Math.abs(best.pH - endpointPh) ? p : best),
        undefined,
      );
  if (!chosen) throw inputError(field, 'the sample has no equivalence point for this titration');
  const endpointVolumeMl = volumeAtPh(model, endpointPh);
  if (endpointVolumeMl === null) {
    const startPh = modelPh(model, 0);
    const reason =
      (model.titrant === 'acid' ? startPh <= endpointPh : startPh >= endpointPh)
        ? `the sample starts at pH ${startPh.toFixed(2)}, already past pH ${endpointPh}`
        : `the titrant never brings the sample to pH ${endpointPh}`;
    throw inputError(field, reason);
  }
  const perMl = (model.titrantNormality * factor) / model.sampleVolumeMl;
  const errorMl = endpointVolumeMl - chosen.volumeMl;
  return {
    endpointPh,
    endpointVolumeMl,
    equivalence: chosen,
    errorMl,
    errorMgL: errorMl * perMl,
    trueResultMgL: chosen.volumeMl * perMl,
    endpointResultMgL: endpointVolumeMl * perMl,
    errorPercent: (errorMl / chosen.volumeMl) * 100,
  };
}

/** pH of a pure CO2 solution of C_T, the total-alkalinity equivalence point [charge balance; Plummer and Busenberg 1982]. */
export function totalEquivalencePh(totalCarbonateM: number, temperatureC = 25, ionicStrength = 0): number {
  const model = createModel({ sampleVolumeMl: 1, titrant: 'acid', titrantNormality: 1, temperatureC, ionicStrength, strongBaseEqL: 0, totalCarbonateM });
  return modelPh(model, 0);
}

/** pH of a pure NaHCO3 solution of C_T, the carbonate equivalence point (≈ ½(pK1 + pK2)) [charge balance; Plummer and Busenberg 1982]. */
export function carbonateEquivalencePh(totalCarbonateM: number, temperatureC = 25, ionicStrength = 0): number {
  const model = createModel({
    sampleVolumeMl: 1,
    titrant: 'acid',
    titrantNormality: 1,
    temperatureC,
    ionicStrength,
    strongBaseEqL: totalCarbonateM,
    totalCarbonateM,
  });
  return modelPh(model, 0);
}

/** Evenly spaced volumes 0..maxVolumeMl with `intervals` steps, plus any extra volumes, sorted and unique. */
export function volumeGrid(maxVolumeMl: number, intervals: number, extraVolumesMl: readonly number[] = []): number[] {
  const set = new Set<number>();
  for (let i = 0; i <= intervals; i++) set.add(Number(((maxVolumeMl * i) / intervals).toPrecision(12)));
  for (const v of extraVolumesMl) if (v >= 0 && v <= maxVolumeMl) set.add(v);
  return [...set].sort((a, b) => a - b);
}
