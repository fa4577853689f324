import type Decimal from 'decimal.js';
import { z } from 'zod';
import { inputError } from '../errors';
import { readingSchema, type AlkalinityRequest } from '../schemas/calc';
import { parseOrThrow } from '../schemas/parse';
import { acidityMgL } from './acidity';
import { alkalinityMeqL, alkalinityMgL } from './alkalinity';
import { DEFAULT_CACO3_FACTOR, ENDPOINT_PH, type Caco3Factor } from './constants';
import { Dec, type DecimalValue } from './decimal';
import { fixedPhEndpoint, granEndpoint, inflectionEndpoint, phAtVolume, type Reading } from './endpoints';
import { checkStandardRecovery, electrodeCalibration, na2co3AsCaco3, relativePercentDifference, type ElectrodeCalibration } from './qc';
import { toApiNumber } from './rounding';
import { calculateAcidity, calculateAlkalinity, type AcidityResult, type AlkalinityResult } from './service';
import { speciesFromPT } from './speciation';
import {
  acidNormalityFromNa2co3Mass,
  acidNormalityFromNa2co3Solution,
  baseNormalityFromKhpMass,
  baseNormalityFromKhpSolution,
  replicateStatistics,
  STANDARDIZATION_RSD_LIMIT_PERCENT,
} from './standardization';
import { calcWarning, DEFAULT_BURETTE_RESOLUTION_ML, MAX_TITRANT_VOLUME_ML, MIN_TITRE_INCREMENTS, type CalcWarning } from './warnings';

/**
 * Bench helpers: compositions of the engine's functions that the bench (server record and
 * client preview) needs and the calculation API does not offer. No formula is restated here
 * that exists elsewhere in shared/chemistry.
 */

const n6 = (value: Decimal.Value): number => toApiNumber(value);

// ---------------------------------------------------------------------------------------------
// Curves longer than the calculation API accepts
// ---------------------------------------------------------------------------------------------

/** Most readings `calculateAlkalinity` accepts (readingsSchema in shared/schemas/calc.ts). */
export const ENGINE_READINGS_LIMIT = 2000;
/** Most readings a bench titration keeps (an auto-titrator logging every 0.01 mL of a 50-mL burette needs 5,000). */
export const BENCH_READINGS_LIMIT = 10_000;

const longReadingsSchema = z
  .array(readingSchema, { error: 'must be a list of {volumeMl, pH}' })
  .min(2, { error: 'at least two readings are needed' })
  .max(BENCH_READINGS_LIMIT, { error: `at most ${BENCH_READINGS_LIMIT} readings` })
  .superRefine((readings, ctx) => {
    for (let i = 1; i < readings.length; i++) {
      if (readings[i].volumeMl < readings[i - 1].volumeMl) {
        ctx.addIssue({
          code: 'custom',
          path: [i, 'volumeMl'],
          message: `must not be less than the previous reading's volume (${readings[i - 1].volumeMl} mL); volumes are cumulative`,
        });
      }
    }
  });

export type CurveAlkalinityRequest = Omit<AlkalinityRequest, 'readings' | 'volumeToPh83Ml' | 'volumeToTotalEndpointMl' | 'lowAlkalinity'> & {
  readings: Reading[];
};

// The same thresholds calculateAlkalinity applies to a curve (service.ts), so both paths warn alike.
const LOW_ALKALINITY_MGL = 20;
const GRAN_MIN_R_SQUARED = 0.995;

/**
 * Alkalinity from a recorded curve of any length up to BENCH_READINGS_LIMIT: the engine's own
 * curve analysis up to its API limit, and beyond it the same endpoint searches (fixed pH,
 * inflection, Gran) feeding the engine's volume path [SM 2320 B; USGS NFM A6.6.4].
 */
export function alkalinityFromReadings(request: CurveAlkalinityRequest): AlkalinityResult {
  if (Array.isArray(request.readings) && request.readings.length <= ENGINE_READINGS_LIMIT) return calculateAlkalinity(request);
  return alkalinityFromLongCurve(request);
}

/**
 * The long-curve path of alkalinityFromReadings (exported for its equivalence test). Gives the
 * same result as calculateAlkalinity with readings, except that `curve` (the side-by-side
 * comparison of every endpoint method) is null.
 */
export function alkalinityFromLongCurve(request: CurveAlkalinityRequest): AlkalinityResult {
  const readings = parseOrThrow(z.object({ readings: longReadingsSchema }).loose(), request).readings as Reading[];
  const { sampleVolumeMl, titrantNormality } = request;
  const method = request.endpointMethod ?? 'fixed';
  const factor: Caco3Factor = request.caco3Factor ?? DEFAULT_CACO3_FACTOR;
  const totalEndpointPh = request.totalEndpointPh ?? ENDPOINT_PH.routineTotal;
  const first = readings[0];
  const startsAboveP = first.pH > ENDPOINT_PH.phenolphthalein;
  const zero = new Dec(0);
  const extra: CalcWarning[] = [];

  let pVolume: Decimal;
  let tVolume: Decimal;
  let pPh: number;
  let tPh: number;
  if (method === 'fixed') {
    pVolume = startsAboveP ? fixedPhEndpoint(readings, ENDPOINT_PH.phenolphthalein, 'falling').volumeMl : zero;
    tVolume = fixedPhEndpoint(readings, totalEndpointPh, 'falling').volumeMl;
    pPh = startsAboveP ? ENDPOINT_PH.phenolphthalein : first.pH;
    tPh = totalEndpointPh;
  } else if (method === 'inflection') {
    const bicarbonate = inflectionEndpoint(readings, 'bicarbonate');
    if (!bicarbonate) throw inputError('readings', 'no bicarbonate inflection found: the readings have no slope below pH 6.35');
    const carbonate = startsAboveP ? inflectionEndpoint(readings, 'carbonate') : null;
    if (startsAboveP && !carbonate) throw inputError('readings', 'the readings start above pH 8.3 but no carbonate inflection phenolphthalein endpoint was found');
    pVolume = carbonate ? carbonate.volumeMl : zero;
    pPh = carbonate ? carbonate.pH : first.pH;
    tVolume = bicarbonate.volumeMl;
    tPh = bicarbonate.pH;
    const t = alkalinityMgL({ titrantVolumeMl: tVolume, titrantNormality, sampleVolumeMl, factor });
    if (first.pH < 7 || t.lt(LOW_ALKALINITY_MGL)) {
      extra.push(
        calcWarning(
          'inflection_not_appropriate',
          'The inflection-point method is not appropriate below about 20 mg/L (0.4 meq/L) or when the sample pH is below 7 (USGS NFM 6.6.4.B).',
          'endpointMethod',
        ),
      );
    }
  } else {
    const gran = granEndpoint(readings, sampleVolumeMl, { titrantNormality });
    if (!gran) throw inputError('readings', 'fewer than 3 readings between pH 3.0 and 4.0 past the endpoint; continue the titration to about pH 3 for a Gran fit');
    pVolume = startsAboveP ? fixedPhEndpoint(readings, ENDPOINT_PH.phenolphthalein, 'falling').volumeMl : zero;
    pPh = startsAboveP ? ENDPOINT_PH.phenolphthalein : first.pH;
    tVolume = new Dec(gran.equivalenceVolumeMl);
    tPh = phAtVolume(readings, gran.equivalenceVolumeMl);
    if (gran.rSquared < GRAN_MIN_R_SQUARED) {
      extra.push(calcWarning('gran_poor_fit', `The Gran line fits poorly (r² = ${n6(gran.rSquared)}); check the readings past the endpoint.`, 'readings'));
    }
  }
  if (pVolume.gt(tVolume)) throw inputError('readings', `the pH 8.3 endpoint (${n6(pVolume)} mL) falls after the total endpoint (${n6(tVolume)} mL)`);

  const { readings: _readings, endpointMethod: _method, totalEndpointPh: _endpoint, ...rest } = request;
  const volumes = calculateAlkalinity({
    ...rest,
    volumeToPh83Ml: pVolume.toNumber(),
    volumeToTotalEndpointMl: tVolume.toNumber(),
    ...(method === 'fixed' ? { totalEndpointPh } : {}),
    initialPh: request.initialPh ?? first.pH,
  });
  // The exact figures come from the unrounded endpoint volumes, as the engine's curve path keeps them.
  const titre = { titrantNormality, sampleVolumeMl };
  const p = alkalinityMgL({ ...titre, titrantVolumeMl: pVolume, factor });
  const t = alkalinityMgL({ ...titre, titrantVolumeMl: tVolume, factor });
  const species = speciesFromPT(p, t);
  // The engine's curve path lists the endpoint-method warnings first and names `readings` for the titre.
  const warnings = [...extra, ...volumes.warnings.map((w) => (w.field === 'volumeToTotalEndpointMl' ? { ...w, field: 'readings' } : w))];
  return {
    ...volumes,
    endpoints: {
      phenolphthalein: { volumeMl: n6(pVolume), pH: n6(pPh), method },
      total: { volumeMl: n6(tVolume), pH: n6(tPh), method },
    },
    endpointMethod: method,
    totalEndpointPh: method === 'fixed' ? totalEndpointPh : null,
    curve: null,
    exact: {
      phenolphthaleinAlkalinity: p.toString(),
      totalAlkalinity: t.toString(),
      phenolphthaleinAlkalinityMeqL: alkalinityMeqL({ ...titre, titrantVolumeMl: pVolume }).toString(),
      totalAlkalinityMeqL: alkalinityMeqL({ ...titre, titrantVolumeMl: tVolume }).toString(),
      phenolphthaleinVolumeMl: pVolume.toString(),
      totalVolumeMl: tVolume.toString(),
      species: { hydroxide: species.hydroxide.toString(), carbonate: species.carbonate.toString(), bicarbonate: species.bicarbonate.toString() },
    },
    warnings,
  };
}

export interface CurveAcidityRequest {
  sampleVolumeMl: number;
  titrantNormality: number;
  readings: Reading[];
  totalEndpointPh?: number;
  peroxideTreatment?: { acidVolumeMl: number; acidNormality: number };
  caco3Factor?: Caco3Factor;
  buretteResolutionMl?: number;
}

export interface CurveAcidityResult extends AcidityResult {
  /** Volumes read off the curve at pH 3.7 and at the total endpoint, mL (exact decimals). */
  curveVolumes: { mineralMl: string; totalMl: string };
}

/**
 * Acidity from a base-titration curve: the volumes at pH 3.7 and 8.3 (or 8.2) by linear
 * interpolation [SM 2310 B, volume read off the curve], then the engine's acidity formula. A
 * curve that starts at or above an endpoint needed no base to reach it, so that volume is 0.
 */
export function acidityFromReadings(request: CurveAcidityRequest): CurveAcidityResult {
  const readings = parseOrThrow(z.object({ readings: longReadingsSchema }).loose(), request).readings as Reading[];
  const totalEndpointPh = request.totalEndpointPh ?? ENDPOINT_PH.totalAcidity;
  const volumeAt = (pH: number): Decimal => (readings[0].pH >= pH ? new Dec(0) : fixedPhEndpoint(readings, pH, 'rising').volumeMl);
  const mineral = volumeAt(ENDPOINT_PH.mineralAcidity);
  const total = volumeAt(totalEndpointPh);
  const result = calculateAcidity({
    sampleVolumeMl: request.sampleVolumeMl,
    titrantNormality: request.titrantNormality,
    volumeToPh37Ml: mineral.toNumber(),
    volumeToPh83Ml: total.toNumber(),
    ...(request.totalEndpointPh === undefined ? {} : { totalEndpointPh: request.totalEndpointPh }),
    ...(request.peroxideTreatment ? { peroxideTreatment: request.peroxideTreatment } : {}),
    ...(request.caco3Factor ? { caco3Factor: request.caco3Factor } : {}),
    ...(request.buretteResolutionMl ? { buretteResolutionMl: request.buretteResolutionMl } : {}),
  });
  const factor = request.caco3Factor ?? DEFAULT_CACO3_FACTOR;
  const exactOf = (volume: Decimal) =>
    acidityMgL({ titrantVolumeMl: volume, titrantNormality: request.titrantNormality, sampleVolumeMl: request.sampleVolumeMl, pretreatment: request.peroxideTreatment, factor });
  const m = exactOf(mineral);
  const t = exactOf(total);
  return {
    ...result,
    exact: { mineralAcidity: m.acidity.toString(), totalAcidity: t.acidity.toString(), mineralAcidityMeqL: m.acidityMeqL.toString(), totalAcidityMeqL: t.acidityMeqL.toString() },
    curveVolumes: { mineralMl: mineral.toString(), totalMl: total.toString() },
  };
}

// ---------------------------------------------------------------------------------------------
// Sample volume and titrant strength
// ---------------------------------------------------------------------------------------------

/** Aliquots a bench measures with volumetric glassware, mL [common practice; SM 2320 B: 50–100 mL, 200 mL for low alkalinity]. */
export const COMMON_SAMPLE_VOLUMES_ML = [10, 25, 50, 100, 200] as const;
/** Titrant strengths of the methods: 0.02 N below about 1000 mg/L, 0.1 N above [SM 2320 B ¶3; SM 2310 B]. */
export const COMMON_TITRANT_NORMALITIES = [0.02, 0.1] as const;
/** Titre aimed for: well inside one 50-mL burette fill, far above its reading step [common practice]. */
export const TARGET_TITRE_ML = 20;
/** Weight of each change (aliquot, titrant) against the log distance from the target titre. */
const CHANGE_PENALTY = 0.5;

export interface TitreSuggestion {
  reason: 'titre_too_small' | 'titre_too_large';
  titrantVolumeMl: number;
  /** Titre range the burette serves: 50 reading steps up to one 50-mL fill. */
  minimumMl: number;
  maximumMl: number;
  suggestedSampleVolumeMl: number;
  suggestedTitrantNormality: number;
  /** The titre those would give for the same sample. */
  predictedTitrantVolumeMl: number;
  message: string;
}

/**
 * A better aliquot or titrant strength when a titre is under 50 burette steps or over one
 * 50-mL fill [EPA 310.1 via NEMI: no more than 50 mL; common practice: 50 reading steps].
 * The titre scales with V_s and inversely with N (A = alkalinity × V_s / (N × 50,000),
 * SM 2320 B), so each common aliquot and strength predicts its titre; among those that fit,
 * the one nearest a 20-mL titre wins, each change to the routine counting against it.
 */
export function titreSuggestion(input: {
  titrantVolumeMl: number;
  sampleVolumeMl: number;
  titrantNormality: number;
  /** The lot's nominal strength, compared with the common strengths (defaults to titrantNormality). */
  nominalNormality?: number;
  buretteResolutionMl?: number;
}): TitreSuggestion | null {
  const { titrantVolumeMl: titre, sampleVolumeMl, titrantNormality } = input;
  const resolution = input.buretteResolutionMl ?? DEFAULT_BURETTE_RESOLUTION_ML;
  const minimumMl = resolution * MIN_TITRE_INCREMENTS;
  const maximumMl = MAX_TITRANT_VOLUME_ML;
  if (!(titre > 0) || (titre >= minimumMl && titre <= maximumMl)) return null;
  const nominal = input.nominalNormality ?? titrantNormality;
  const predict = (volume: number, normality: number) => (titre * (volume / sampleVolumeMl) * nominal) / normality;
  const changes = (o: { volume: number; normality: number }) => Number(o.volume !== sampleVolumeMl) + Number(o.normality !== nominal);
  // Each change to the routine costs as much as a titre e^0.5 ≈ 1.6 times off the target.
  const score = (o: { volume: number; normality: number; predicted: number }) => Math.abs(Math.log(o.predicted / TARGET_TITRE_ML)) + CHANGE_PENALTY * changes(o);
  const choice = [...COMMON_SAMPLE_VOLUMES_ML, sampleVolumeMl]
    .flatMap((volume) => [...COMMON_TITRANT_NORMALITIES, nominal].map((normality) => ({ volume, normality, predicted: predict(volume, normality) })))
    .filter((o) => o.predicted >= minimumMl && o.predicted <= maximumMl)
    .sort((a, b) => score(a) - score(b))[0];
  const reason = titre < minimumMl ? 'titre_too_small' : 'titre_too_large';
  const problem = reason === 'titre_too_small' ? `under ${minimumMl} mL (50 steps of ${resolution} mL)` : `over one ${maximumMl}-mL burette fill (EPA 310.1)`;
  if (!choice) {
    return {
      reason,
      titrantVolumeMl: titre,
      minimumMl,
      maximumMl,
      suggestedSampleVolumeMl: sampleVolumeMl,
      suggestedTitrantNormality: nominal,
      predictedTitrantVolumeMl: titre,
      message: `The titre of ${titre} mL is ${problem}, and no common aliquot or titrant strength brings it into range; use a microburet or dilute the titrant.`,
    };
  }
  const predicted = Math.round(choice.predicted * 100) / 100;
  const changed: string[] = [];
  if (choice.volume !== sampleVolumeMl) changed.push(`a ${choice.volume}-mL sample`);
  if (choice.normality !== nominal) changed.push(`${choice.normality} N titrant`);
  return {
    reason,
    titrantVolumeMl: titre,
    minimumMl,
    maximumMl,
    suggestedSampleVolumeMl: choice.volume,
    suggestedTitrantNormality: choice.normality,
    predictedTitrantVolumeMl: predicted,
    message: `The titre of ${titre} mL is ${problem}. Use ${changed.join(' and ')}: about ${predicted} mL of titrant.`,
  };
}

// ---------------------------------------------------------------------------------------------
// Review: a result far from its point's history
// ---------------------------------------------------------------------------------------------

export interface HistoryComparison {
  n: number;
  mean: number | null;
  standardDeviation: number | null;
  /** (value − mean) / SD; null with too little history or no spread. */
  zScore: number | null;
  /** True beyond `sdMultiplier` SD; null when the history is shorter than `minCount`. */
  unusual: boolean | null;
}

/**
 * Flags a value more than k standard deviations (sample SD, n − 1) from the mean of earlier
 * values, the ±3s control limit of a Shewhart chart [SM 1020 B control charts, from memory;
 * common practice]. With no spread at all, any different value is unusual.
 */
export function historyComparison(value: DecimalValue, history: readonly DecimalValue[], options: { sdMultiplier?: number; minCount?: number } = {}): HistoryComparison {
  const k = options.sdMultiplier ?? 3;
  const minCount = Math.max(2, options.minCount ?? 10);
  const n = history.length;
  if (n < 2) return { n, mean: null, standardDeviation: null, zScore: null, unusual: null };
  const xs = history.map((h) => new Dec(h));
  const mean = xs.reduce((a, b) => a.plus(b), new Dec(0)).div(n);
  const sd = xs.reduce((a, x) => a.plus(x.minus(mean).pow(2)), new Dec(0)).div(n - 1).sqrt();
  const deviation = new Dec(value).minus(mean);
  const zScore = sd.isZero() ? null : n6(deviation.div(sd));
  const unusual = n < minCount ? null : sd.isZero() ? !deviation.isZero() : deviation.abs().gt(sd.times(k));
  return { n, mean: n6(mean), standardDeviation: n6(sd), zScore, unusual };
}

// ---------------------------------------------------------------------------------------------
// Titrant standardisation
// ---------------------------------------------------------------------------------------------

export type PrimaryStandard = 'Na2CO3' | 'KHP';

export interface StandardizationInput {
  primaryStandard: PrimaryStandard;
  /** `solution`: aliquots of a standard solution (g/L); `mass`: each replicate weighed directly. */
  mode: 'solution' | 'mass';
  standardGramsPerL?: number;
  replicates: Array<{ standardVolumeMl?: number; standardGrams?: number; titrantVolumeMl: number }>;
  rsdLimitPercent?: number;
}

export interface StandardizationOutcome {
  replicateNormalities: string[];
  /** Mean of the replicates, the normality titrations use. */
  normality: string;
  standardDeviation: string;
  rsdPercent: string;
  rsdLimitPercent: number;
  accepted: boolean;
}

/**
 * Titrant normality from replicate titrations of a primary standard, their mean, SD and RSD,
 * accepted at RSD ≤ 0.5 % by default [SM 2320 B ¶3 (Na2CO3); SM 2310 B ¶3 (KHP); common
 * practice for the acceptance]. Replicates missing a quantity answer a field error.
 */
export function standardize(input: StandardizationInput): StandardizationOutcome {
  if (input.replicates.length < 2) throw inputError('replicates', 'titrate at least in duplicate');
  const normalities = input.replicates.map((r, i) => {
    const need = (value: number | undefined, field: string) => {
      if (value === undefined || !(value > 0)) throw inputError(`replicates.${i}.${field}`, 'required, greater than 0');
      return value;
    };
    if (input.mode === 'solution') {
      if (input.standardGramsPerL === undefined || !(input.standardGramsPerL > 0)) throw inputError('standardGramsPerL', 'required for a standard solution');
      const volume = need(r.standardVolumeMl, 'standardVolumeMl');
      return input.primaryStandard === 'Na2CO3'
        ? acidNormalityFromNa2co3Solution({ na2co3GramsPerL: input.standardGramsPerL, na2co3VolumeMl: volume, acidVolumeMl: r.titrantVolumeMl })
        : baseNormalityFromKhpSolution({ khpGramsPerL: input.standardGramsPerL, khpVolumeMl: volume, baseVolumeMl: r.titrantVolumeMl });
    }
    const grams = need(r.standardGrams, 'standardGrams');
    return input.primaryStandard === 'Na2CO3'
      ? acidNormalityFromNa2co3Mass({ na2co3Grams: grams, acidVolumeMl: r.titrantVolumeMl })
      : baseNormalityFromKhpMass({ khpGrams: grams, baseVolumeMl: r.titrantVolumeMl });
  });
  const stats = replicateStatistics(normalities);
  const limit = input.rsdLimitPercent ?? STANDARDIZATION_RSD_LIMIT_PERCENT;
  return {
    replicateNormalities: normalities.map((n) => n.toString()),
    normality: stats.mean.toString(),
    standardDeviation: stats.standardDeviation.toString(),
    rsdPercent: stats.relativeStandardDeviationPercent.toString(),
    rsdLimitPercent: limit,
    accepted: stats.relativeStandardDeviationPercent.lte(limit),
  };
}

// ---------------------------------------------------------------------------------------------
// pH meter calibration
// ---------------------------------------------------------------------------------------------

export interface BufferEntry {
  nominalPh: number;
  mV: number;
}

export interface MeterCalibrationOutcome {
  calibration: ElectrodeCalibration;
  /** Buffers after the first two, read back through the calibration line. */
  checks: Array<{ nominalPh: number; mV: number; readPh: number; errorPh: number; passed: boolean }>;
  checkTolerancePh: number;
  passed: boolean;
  warnings: Array<{ code: 'buffer_span_small'; message: string; field: string }>;
}

/** Span of the calibration buffers below which the calibration is flagged [EPA SW-846 9040C: about 3 pH units or more]. */
export const MIN_BUFFER_SPAN = 3;
/** A check buffer should read within ±0.1 pH [common practice in operator training]. */
export const CHECK_BUFFER_TOLERANCE_PH = 0.1;

/**
 * Two-buffer slope and offset by the engine, then each further buffer read back through the
 * line pH = pH1 + (mV − mV1) / slope and passed within ±0.1 pH [EPA SW-846 9040C; common practice].
 */
export function meterCalibration(
  buffers: readonly BufferEntry[],
  temperatureC: number,
  window?: { minPercent: number; maxPercent: number },
  checkTolerancePh: number = CHECK_BUFFER_TOLERANCE_PH,
): MeterCalibrationOutcome {
  if (buffers.length < 2) throw inputError('buffers', 'at least two buffers are needed');
  const [a, b] = buffers;
  const calibration = electrodeCalibration({ pH: a.nominalPh, mV: a.mV }, { pH: b.nominalPh, mV: b.mV }, temperatureC, window);
  const signedSlope = (b.mV - a.mV) / (b.nominalPh - a.nominalPh);
  const checks = buffers.slice(2).map((c) => {
    const readPh = a.nominalPh + (c.mV - a.mV) / signedSlope;
    const errorPh = readPh - c.nominalPh;
    return { nominalPh: c.nominalPh, mV: c.mV, readPh: n6(readPh), errorPh: n6(errorPh), passed: Math.abs(errorPh) <= checkTolerancePh + 1e-9 };
  });
  const warnings: MeterCalibrationOutcome['warnings'] = [];
  if (calibration.bufferSpan < MIN_BUFFER_SPAN - 1e-9) {
    warnings.push({ code: 'buffer_span_small', message: `The calibration buffers are ${n6(calibration.bufferSpan)} pH apart; EPA SW-846 9040C advises about 3 or more.`, field: 'buffers.1.nominalPh' });
  }
  return { calibration, checks, checkTolerancePh, passed: calibration.accepted && checks.every((c) => c.passed), warnings };
}

// ---------------------------------------------------------------------------------------------
// QC batch
// ---------------------------------------------------------------------------------------------

export interface QcLimits {
  duplicateRpdMaxPercent: number;
  checkStandardRecoveryMinPercent: number;
  checkStandardRecoveryMaxPercent: number;
}

export interface QcInput {
  duplicates: Array<{ label?: string | null; firstResult: number; secondResult: number }>;
  checkStandards: Array<{ label?: string | null; trueValue?: number; trueValueNa2co3MgL?: number; measured: number }>;
  blanks: Array<{ label?: string | null; measured: number; reportingLimit: number }>;
}

export interface QcEvaluation {
  duplicates: Array<{ label: string | null; firstResult: number; secondResult: number; rpdPercent: number; limitPercent: number; passed: boolean }>;
  checkStandards: Array<{ label: string | null; trueValue: number; measured: number; recoveryPercent: number; window: { minPercent: number; maxPercent: number }; passed: boolean }>;
  blanks: Array<{ label: string | null; measured: number; reportingLimit: number; passed: boolean }>;
  passed: boolean;
  failures: string[];
}

/**
 * Duplicate RPD against the lab's limit (10 % by default), check-standard recovery against its
 * window (90–110 %), and blanks below the reporting limit [common practice, domain.md 6; SM 1020 B;
 * 40 CFR 136.7]. A Na2CO3 standard's true value converts by × 100.09/105.99.
 */
export function evaluateQc(input: QcInput, limits: QcLimits): QcEvaluation {
  const failures: string[] = [];
  const duplicates = input.duplicates.map((d, i) => {
    const rpd = relativePercentDifference(d.firstResult, d.secondResult);
    const passed = rpd.lte(limits.duplicateRpdMaxPercent);
    if (!passed) failures.push(`duplicates.${i}`);
    return { label: d.label ?? null, firstResult: d.firstResult, secondResult: d.secondResult, rpdPercent: n6(rpd), limitPercent: limits.duplicateRpdMaxPercent, passed };
  });
  const window = { minPercent: limits.checkStandardRecoveryMinPercent, maxPercent: limits.checkStandardRecoveryMaxPercent };
  const checkStandards = input.checkStandards.map((s, i) => {
    let trueValue: Decimal;
    if (s.trueValue !== undefined) trueValue = new Dec(s.trueValue);
    else if (s.trueValueNa2co3MgL !== undefined) trueValue = na2co3AsCaco3(s.trueValueNa2co3MgL);
    else throw inputError(`checkStandards.${i}.trueValue`, 'required (mg/L as CaCO3), or give trueValueNa2co3MgL');
    const recovery = checkStandardRecovery(s.measured, trueValue);
    const passed = recovery.gte(window.minPercent) && recovery.lte(window.maxPercent);
    if (!passed) failures.push(`checkStandards.${i}`);
    return { label: s.label ?? null, trueValue: n6(trueValue), measured: s.measured, recoveryPercent: n6(recovery), window, passed };
  });
  const blanks = input.blanks.map((b, i) => {
    const passed = b.measured < b.reportingLimit;
    if (!passed) failures.push(`blanks.${i}`);
    return { label: b.label ?? null, measured: b.measured, reportingLimit: b.reportingLimit, passed };
  });
  return { duplicates, checkStandards, blanks, passed: failures.length === 0, failures };
}

// ---------------------------------------------------------------------------------------------
// Digester volatile acids
// ---------------------------------------------------------------------------------------------

export interface VolatileAcidsRatio {
  ratio: number;
  /** ≤ 0.25 stable, up to 0.3 watch, above 0.3 act (reduce feed, add alkalinity). */
  status: 'stable' | 'watch' | 'act';
}

/**
 * VA/alkalinity ratio (mg/L as acetic acid ÷ mg/L as CaCO3): about 0.1–0.25 stable, above about
 * 0.3 act [Gerardi 2003 for the concept; thresholds common practice].
 */
export function volatileAcidsRatio(volatileAcidsMgL: DecimalValue, totalAlkalinityMgL: DecimalValue): VolatileAcidsRatio | null {
  const alk = new Dec(totalAlkalinityMgL);
  if (!alk.gt(0)) return null;
  const ratio = new Dec(volatileAcidsMgL).div(alk);
  return { ratio: n6(ratio), status: ratio.lte(0.25) ? 'stable' : ratio.lte(0.3) ? 'watch' : 'act' };
}
