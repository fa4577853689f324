import type Decimal from 'decimal.js';
import { InputError, inputError } from '../errors.js';
import {
  acidityRequestSchema,
  alkalinityRequestSchema,
  curveRequestSchema,
  lsiRequestSchema,
  speciationRequestSchema,
  type AcidityRequest,
  type AlkalinityRequest,
  type CurveRequest,
  type LsiRequest,
  type SpeciationRequest,
} from '../schemas/calc.js';
import { parseOrThrow } from '../schemas/parse.js';
import { acidityMgL } from './acidity.js';
import { alkalinityMeqL, alkalinityMgL, lowAlkalinityTwoPoint, recommendedTotalEndpointPh } from './alkalinity.js';
import { CACO3_MG_PER_EQ, DEFAULT_CACO3_FACTOR, ENDPOINT_PH, EQUIVALENT_WEIGHT, type Caco3Factor } from './constants.js';
import { langelierApproximate, langelierExact, lsiTendency, rsiTendency, ryznarIndex, type LsiTendency, type RsiTendency } from './corrosion.js';
import {
  carbonateModelFromTotalCarbonate,
  carbonateWaterModel,
  endpointError,
  equivalencePoints,
  modelCurve,
  strongAcidModel,
  strongBaseModel,
  volumeGrid,
  type EquivalenceName,
  type Titrant,
  type TitrationModel,
} from './curve.js';
import { Dec } from './decimal.js';
import {
  derivativeSeries,
  fixedPhEndpoint,
  granEndpoint,
  phAtVolume,
  inflectionEndpoint,
  INFLECTION_WINDOWS,
  type DerivativePoint,
  type FixedPhEndpoint,
  type GranResult,
  type InflectionEndpoint,
  type Reading,
} from './endpoints.js';
import { toApiNumber } from './rounding.js';
import {
  CONSTANTS_SOURCE,
  DEBYE_HUCKEL_A_SOURCE,
  equilibriumSpeciation,
  hydroxideFromPh,
  ionicStrengthFromConductance,
  ionicStrengthFromTds,
  speciesFromPT,
  type PtCase,
} from './speciation.js';
import { calcWarning, titrantVolumeWarnings, type CalcWarning } from './warnings.js';

/**
 * The public calculation API (POST /api/v1/calc/*; its field names are a contract): each function validates its own input
 * with the shared schema (throwing InputError with field reasons), so a route may pass the
 * request body straight in. Numbers carry 6 significant figures; recorded figures also come
 * as exact decimal strings under `exact`, which is what should be stored.
 */

/** 6 significant figures: decimal rounding for recorded figures, plain toPrecision for solver output. */
const n6 = (value: Decimal.Value): number => (typeof value === 'number' ? Number(value.toPrecision(6)) : toApiNumber(value));

// ---------------------------------------------------------------------------------------------
// Shared pieces
// ---------------------------------------------------------------------------------------------

export type IonicStrengthSource = 'tds' | 'specific_conductance' | 'given' | 'none';

export interface ActivityOut {
  applied: boolean;
  ionicStrength: number;
  ionicStrengthSource: IonicStrengthSource;
  /** Debye–Hückel A used by Davies (SM 2330 B temperature form). */
  debyeHuckelA: number;
  debyeHuckelASource: string;
  gamma1: number;
  gamma2: number;
}

export interface ConstantsOut {
  temperatureC: number;
  logK1: number;
  logK2: number;
  logKH: number;
  logKspCalcite: number;
  logKw: number;
  source: string;
}

export interface EquilibriumSpeciesOut {
  method: string;
  pH: number;
  temperatureC: number;
  /** mg/L as CaCO3. */
  hydroxide: number;
  carbonate: number;
  bicarbonate: number;
  /** Free H+, mg/L as CaCO3 (counts against alkalinity). */
  hydrogen: number;
  /** mg/L as the ion; carbonic acid as CO2. */
  asIon: { hydroxide: number; carbonate: number; bicarbonate: number; carbonDioxide: number };
  /** mol/L. */
  molar: { hydrogen: number; hydroxide: number; bicarbonate: number; carbonate: number; carbonicAcid: number; totalCarbonate: number };
  totalCarbonateMmolL: number;
  carbonateToBicarbonateRatio: number;
  /** mg CaCO3 per equivalent used to convert eq/L ↔ mg/L as CaCO3. */
  caco3MgPerEq: number;
  activity: ActivityOut;
  constants: ConstantsOut;
}

function ionicStrengthOf(input: { tdsMgL?: number; specificConductanceUsCm?: number; ionicStrength?: number }): {
  ionicStrength: number;
  source: IonicStrengthSource;
} {
  if (input.ionicStrength !== undefined) return { ionicStrength: input.ionicStrength, source: 'given' };
  if (input.tdsMgL !== undefined) return { ionicStrength: ionicStrengthFromTds(input.tdsMgL), source: 'tds' };
  if (input.specificConductanceUsCm !== undefined) {
    return { ionicStrength: ionicStrengthFromConductance(input.specificConductanceUsCm), source: 'specific_conductance' };
  }
  return { ionicStrength: 0, source: 'none' };
}

function constantsOut(c: { temperatureC: number; logK1: number; logK2: number; logKH: number; logKspCalcite: number; logKw: number }): ConstantsOut {
  return {
    temperatureC: c.temperatureC,
    logK1: n6(c.logK1),
    logK2: n6(c.logK2),
    logKH: n6(c.logKH),
    logKspCalcite: n6(c.logKspCalcite),
    logKw: n6(c.logKw),
    source: CONSTANTS_SOURCE,
  };
}

function activityOut(a: { applied: boolean; ionicStrength: number; debyeHuckelA: number; gamma1: number; gamma2: number }, source: IonicStrengthSource): ActivityOut {
  return {
    applied: a.applied,
    ionicStrength: n6(a.ionicStrength),
    ionicStrengthSource: a.applied ? source : 'none',
    debyeHuckelA: n6(a.debyeHuckelA),
    debyeHuckelASource: DEBYE_HUCKEL_A_SOURCE,
    gamma1: n6(a.gamma1),
    gamma2: n6(a.gamma2),
  };
}

/** Ionic strength above which the Davies equation is no longer trusted here [Davies 1962: suitable to about 0.1–0.5]. */
const DAVIES_WARNING_IONIC_STRENGTH = 0.1;
/** Above this pH, non-carbonate bases may matter and the hand method is not used [USGS NFM 6.6.5.B]. */
const CARBONATE_ONLY_MAX_PH = 9.2;

function equilibriumOut(
  pH: number,
  totalAlkalinityMgL: number,
  temperatureC: number | undefined,
  strength: { ionicStrength: number; source: IonicStrengthSource },
  caco3MgPerEq: number,
  warnings: CalcWarning[],
  inconsistencyField = 'totalAlkalinity',
): EquilibriumSpeciesOut {
  const t = temperatureC ?? 25;
  if (temperatureC === undefined) {
    warnings.push(calcWarning('temperature_assumed', 'No temperature given; the equilibrium constants are taken at 25 °C.', 'temperatureC'));
  }
  if (strength.source === 'none') {
    warnings.push(
      calcWarning('activity_not_corrected', 'No TDS, specific conductance or ionic strength given; activity coefficients are taken as 1.', 'tdsMgL'),
    );
  }
  if (strength.ionicStrength > DAVIES_WARNING_IONIC_STRENGTH) {
    warnings.push(
      calcWarning('ionic_strength_high', `Ionic strength ${n6(strength.ionicStrength)} mol/L is above 0.1, where the Davies equation loses accuracy.`),
    );
  }
  if (pH > CARBONATE_ONLY_MAX_PH) {
    warnings.push(
      calcWarning(
        'non_carbonate_bases_possible',
        `pH ${pH} is above 9.2: borate, silicate, phosphate or ammonia may carry part of the alkalinity, which this calculation assigns to carbonate.`,
      ),
    );
  }
  let s: ReturnType<typeof equilibriumSpeciation>;
  try {
    s = equilibriumSpeciation({ pH, totalAlkalinityMgL, temperatureC: t, ionicStrength: strength.ionicStrength, caco3MgPerEq });
  } catch (e) {
    // Name the request's own field: for a titration the pH, not the derived T, is the odd one out.
    if (e instanceof InputError && inconsistencyField !== 'totalAlkalinity') {
      throw inputError(inconsistencyField, `implies more hydroxide than the measured total alkalinity (${n6(totalAlkalinityMgL)} mg/L)`);
    }
    throw e;
  }
  const m = s.molar;
  return {
    method: 'equilibrium from pH, temperature and total alkalinity (USGS NFM 6.6.5.B; SM 2330)',
    pH,
    temperatureC: t,
    hydroxide: n6(s.asCaco3.hydroxide),
    carbonate: n6(s.asCaco3.carbonate),
    bicarbonate: n6(s.asCaco3.bicarbonate),
    hydrogen: n6(s.asCaco3.hydrogen),
    asIon: {
      hydroxide: n6(s.asIon.hydroxide),
      carbonate: n6(s.asIon.carbonate),
      bicarbonate: n6(s.asIon.bicarbonate),
      carbonDioxide: n6(s.asIon.carbonDioxide),
    },
    molar: {
      hydrogen: n6(m.hydrogen),
      hydroxide: n6(m.hydroxide),
      bicarbonate: n6(m.bicarbonate),
      carbonate: n6(m.carbonate),
      carbonicAcid: n6(m.carbonicAcid),
      totalCarbonate: n6(m.totalCarbonate),
    },
    totalCarbonateMmolL: n6(m.totalCarbonate * 1000),
    carbonateToBicarbonateRatio: n6(s.carbonateToBicarbonateRatio),
    caco3MgPerEq,
    activity: activityOut(s.activity, strength.source),
    constants: constantsOut(s.constants),
  };
}

export interface PtSpeciesOut {
  method: string;
  case: PtCase;
  /** mg/L as CaCO3. */
  hydroxide: number;
  carbonate: number;
  bicarbonate: number;
  /** Tolerance used for P = T/2 and P = T, mg/L as CaCO3. */
  toleranceMgL: number;
}

function ptSpecies(p: Decimal, t: Decimal): { out: PtSpeciesOut; exact: { hydroxide: string; carbonate: string; bicarbonate: string } } {
  const s = speciesFromPT(p, t);
  return {
    out: {
      method: 'from P and T (SM 2320 B, Table 2320:II)',
      case: s.case,
      hydroxide: n6(s.hydroxide),
      carbonate: n6(s.carbonate),
      bicarbonate: n6(s.bicarbonate),
      toleranceMgL: s.toleranceMgL.toNumber(),
    },
    exact: { hydroxide: s.hydroxide.toString(), carbonate: s.carbonate.toString(), bicarbonate: s.bicarbonate.toString() },
  };
}

// ---------------------------------------------------------------------------------------------
// Alkalinity
// ---------------------------------------------------------------------------------------------

export type AlkalinityEndpointMethod = 'fixed' | 'inflection' | 'gran' | 'two_point';

export interface EndpointOut {
  volumeMl: number;
  /** The endpoint pH (fixed), or the pH on the curve at the endpoint volume (inflection, Gran). */
  pH: number;
  method: AlkalinityEndpointMethod;
}

export interface CurveAnalysisOut {
  fixed: {
    totalEndpointPh: number;
    phenolphthalein: { volumeMl: number; pH: number } | null;
    total: { volumeMl: number; pH: number } | null;
    phenolphthaleinAlkalinity: number | null;
    totalAlkalinity: number | null;
  };
  inflection: {
    carbonate: { volumeMl: number; pH: number; maxSlope: number; tiedMidpointsMl: number[] } | null;
    bicarbonate: { volumeMl: number; pH: number; maxSlope: number; tiedMidpointsMl: number[] } | null;
    phenolphthaleinAlkalinity: number | null;
    totalAlkalinity: number | null;
    windows: typeof INFLECTION_WINDOWS;
  };
  gran: (Omit<GranResult, 'points'> & { points: GranResult['points']; totalAlkalinity: number }) | null;
  /** ΔpH/ΔV at midpoints, for the second axis. */
  derivative: DerivativePoint[];
}

export interface AlkalinityResult {
  /** P, mg/L as CaCO3. */
  phenolphthaleinAlkalinity: number;
  /** T, mg/L as CaCO3. */
  totalAlkalinity: number;
  phenolphthaleinAlkalinityMeqL: number;
  /** A × N × 1000 / V_s: the titration's own meq/L, independent of the CaCO3 factor. */
  totalAlkalinityMeqL: number;
  species: PtSpeciesOut;
  speciesEquilibrium: EquilibriumSpeciesOut | null;
  endpoints: { phenolphthalein: EndpointOut; total: EndpointOut };
  endpointMethod: AlkalinityEndpointMethod;
  /** Nominal total endpoint pH (fixed methods), or the first endpoint pH of the two-point method. */
  totalEndpointPh: number | null;
  /** Table 2320:I endpoint for the measured T. */
  recommendedTotalEndpointPh: number;
  caco3Factor: Caco3Factor;
  curve: CurveAnalysisOut | null;
  lowAlkalinity: { equivalenceVolumeMl: number; firstEndpointPh: number; secondEndpointPh: number } | null;
  constants: { caco3Factor: Caco3Factor; caco3MgPerMeq: number; formula: string; source: string };
  exact: {
    phenolphthaleinAlkalinity: string;
    totalAlkalinity: string;
    phenolphthaleinAlkalinityMeqL: string;
    totalAlkalinityMeqL: string;
    phenolphthaleinVolumeMl: string;
    totalVolumeMl: string;
    species: { hydroxide: string; carbonate: string; bicarbonate: string };
  };
  warnings: CalcWarning[];
}

/** Alkalinity below which the two-point method is the method's choice [SM 2320 B ¶4d]. */
const LOW_ALKALINITY_MGL = 20;
/** Half the 0.3-pH spacing of Table 2320:I's rows: an endpoint further from the recommendation is flagged. */
const ENDPOINT_RECOMMENDATION_TOLERANCE = 0.15;
/** r² below which a Gran line is flagged [common practice]. */
const GRAN_MIN_R_SQUARED = 0.995;
/** Microburet reading resolution, mL, assumed for the two-point method [SM 2320 B ¶4d; common practice]. */
const MICROBURET_RESOLUTION_ML = 0.01;

function endpointPhWarnings(endpointPh: number, totalMgL: number, field: string): CalcWarning[] {
  const recommended = recommendedTotalEndpointPh(totalMgL);
  // pH 4.5 is always acceptable: 40 CFR 136.3 Table IB lists alkalinity as titration to pH 4.5.
  const routine = Math.abs(endpointPh - ENDPOINT_PH.routineTotal) < 1e-9;
  if (endpointPh < 4.3 - 1e-9 || endpointPh > 4.9 + 1e-9) {
    return [
      calcWarning(
        'endpoint_ph_not_recommended',
        `Total endpoint pH ${endpointPh} is outside the 4.3–4.9 range of SM 2320 B Table 2320:I (about ${recommended} for ${n6(totalMgL)} mg/L).`,
        field,
      ),
    ];
  }
  if (!routine && Math.abs(endpointPh - recommended) > ENDPOINT_RECOMMENDATION_TOLERANCE + 1e-9) {
    return [
      calcWarning(
        'endpoint_ph_not_recommended',
        `For about ${n6(totalMgL)} mg/L, SM 2320 B Table 2320:I suggests a total endpoint near pH ${recommended} (or the routine 4.5), not ${endpointPh}.`,
        field,
      ),
    ];
  }
  return [];
}

interface Derived {
  pVolume: Decimal;
  tVolume: Decimal;
  pEndpoint: EndpointOut;
  tEndpoint: EndpointOut;
  method: AlkalinityEndpointMethod;
  totalEndpointPh: number | null;
  curve: CurveAnalysisOut | null;
  lowAlkalinity: AlkalinityResult['lowAlkalinity'];
}

/** The fixed endpoint, or the InputError saying why it is not bracketed (thrown only if that method is chosen). */
function tryFixed(readings: Reading[], pH: number): FixedPhEndpoint | InputError {
  try {
    return fixedPhEndpoint(readings, pH, 'falling');
  } catch (e) {
    if (e instanceof InputError) return e;
    throw e;
  }
}

const found = <T>(x: T | InputError): T | null => (x instanceof InputError ? null : x);

function inflectionOut(e: InflectionEndpoint | null) {
  return e && { volumeMl: n6(e.volumeMl), pH: n6(e.pH), maxSlope: n6(e.maxSlope), tiedMidpointsMl: e.tiedMidpointsMl };
}

function analyseReadings(
  input: { readings: Reading[]; sampleVolumeMl: number; titrantNormality: number; endpointMethod?: 'fixed' | 'inflection' | 'gran' },
  totalEndpointPh: number,
  factor: Caco3Factor,
  warnings: CalcWarning[],
): Derived {
  const { readings, sampleVolumeMl, titrantNormality } = input;
  const method = input.endpointMethod ?? 'fixed';
  const first = readings[0];
  const startsAboveP = first.pH > ENDPOINT_PH.phenolphthalein;
  const mg = (v: Decimal.Value) => alkalinityMgL({ titrantVolumeMl: v, titrantNormality, sampleVolumeMl, factor });

  // P is zero when the sample starts at or below pH 8.3 [IUPAC Gold Book 09038].
  const zeroP = new Dec(0);
  const fixedPAttempt = startsAboveP ? tryFixed(readings, ENDPOINT_PH.phenolphthalein) : null;
  const fixedTAttempt = tryFixed(readings, totalEndpointPh);
  const fixedP = found(fixedPAttempt);
  const fixedT = found(fixedTAttempt);
  const carbonate = inflectionEndpoint(readings, 'carbonate');
  const bicarbonate = inflectionEndpoint(readings, 'bicarbonate');
  const gran = granEndpoint(readings, sampleVolumeMl, { titrantNormality });
  const fixedPVolume = startsAboveP ? fixedP?.volumeMl ?? null : zeroP;
  const inflectionPVolume = startsAboveP ? carbonate?.volumeMl ?? null : zeroP;

  const curve: CurveAnalysisOut = {
    fixed: {
      totalEndpointPh,
      phenolphthalein: fixedPVolume && { volumeMl: n6(fixedPVolume), pH: startsAboveP ? ENDPOINT_PH.phenolphthalein : first.pH },
      total: fixedT && { volumeMl: n6(fixedT.volumeMl), pH: totalEndpointPh },
      phenolphthaleinAlkalinity: fixedPVolume && n6(mg(fixedPVolume)),
      totalAlkalinity: fixedT && n6(mg(fixedT.volumeMl)),
    },
    inflection: {
      carbonate: inflectionOut(carbonate),
      bicarbonate: inflectionOut(bicarbonate),
      phenolphthaleinAlkalinity: inflectionPVolume && n6(mg(inflectionPVolume)),
      totalAlkalinity: bicarbonate && n6(mg(bicarbonate.volumeMl)),
      windows: INFLECTION_WINDOWS,
    },
    gran: gran && {
      ...gran,
      slope: n6(gran.slope),
      intercept: n6(gran.intercept),
      r: n6(gran.r),
      rSquared: n6(gran.rSquared),
      equivalenceVolumeMl: n6(gran.equivalenceVolumeMl),
      slopeToNormalityRatio: gran.slopeToNormalityRatio === null ? null : n6(gran.slopeToNormalityRatio),
      points: gran.points.map((p) => ({ volumeMl: p.volumeMl, pH: p.pH, f1: n6(p.f1) })),
      totalAlkalinity: n6(mg(new Dec(gran.equivalenceVolumeMl))),
    },
    derivative: derivativeSeries(readings),
  };

  const endpointOut = (volume: Decimal, pH: number): EndpointOut => ({ volumeMl: n6(volume), pH: n6(pH), method });
  // P from the fixed 8.3 endpoint (fixed and Gran methods): zero when the start is at or below 8.3.
  const fixedPOrThrow = (): Decimal => {
    if (fixedPAttempt instanceof InputError) throw fixedPAttempt;
    return fixedPAttempt?.volumeMl ?? zeroP;
  };

  let pVolume: Decimal;
  let tVolume: Decimal;
  let pPh: number;
  let tPh: number;
  if (method === 'fixed') {
    if (fixedTAttempt instanceof InputError) throw fixedTAttempt;
    pVolume = fixedPOrThrow();
    tVolume = fixedTAttempt.volumeMl;
    pPh = startsAboveP ? ENDPOINT_PH.phenolphthalein : first.pH;
    tPh = totalEndpointPh;
  } else if (method === 'inflection') {
    if (!bicarbonate) throw inputError('readings', 'no bicarbonate inflection found: the readings have no slope below pH 6.35');
    if (inflectionPVolume === null) throw inputError('readings', 'the readings start above pH 8.3 but show no carbonate inflection');
    pVolume = inflectionPVolume;
    pPh = startsAboveP && carbonate ? carbonate.pH : first.pH;
    tVolume = bicarbonate.volumeMl;
    tPh = bicarbonate.pH;
    if (first.pH < 7 || mg(tVolume).lt(LOW_ALKALINITY_MGL)) {
      warnings.push(
        calcWarning(
          'inflection_not_appropriate',
          'The inflection-point method is not appropriate below about 20 mg/L (0.4 meq/L) or when the sample pH is below 7 (USGS NFM 6.6.4.B).',
          'endpointMethod',
        ),
      );
    }
  } else {
    if (!gran) {
      throw inputError('readings', 'fewer than 3 readings between pH 3.0 and 4.0 past the endpoint; continue the titration to about pH 3 for a Gran fit');
    }
    pVolume = fixedPOrThrow();
    pPh = startsAboveP ? ENDPOINT_PH.phenolphthalein : first.pH;
    tVolume = new Dec(gran.equivalenceVolumeMl);
    tPh = phAtVolume(readings, gran.equivalenceVolumeMl);
    if (gran.rSquared < GRAN_MIN_R_SQUARED) {
      warnings.push(calcWarning('gran_poor_fit', `The Gran line fits poorly (r² = ${n6(gran.rSquared)}); check the readings past the endpoint.`, 'readings'));
    }
  }
  if (pVolume.gt(tVolume)) {
    throw inputError('readings', `the pH 8.3 endpoint (${n6(pVolume)} mL) falls after the total endpoint (${n6(tVolume)} mL)`);
  }
  return {
    pVolume,
    tVolume,
    pEndpoint: endpointOut(pVolume, pPh),
    tEndpoint: endpointOut(tVolume, tPh),
    method,
    totalEndpointPh: method === 'fixed' ? totalEndpointPh : null,
    curve,
    lowAlkalinity: null,
  };
}

/** Alkalinity by POST /api/v1/calc/alkalinity: P, T, meq/L, species, endpoints, warnings [SM 2320 B; USGS NFM A6.6]. */
export function calculateAlkalinity(request: AlkalinityRequest): AlkalinityResult {
  const input = parseOrThrow(alkalinityRequestSchema, request);
  const factor: Caco3Factor = input.caco3Factor ?? DEFAULT_CACO3_FACTOR;
  const { sampleVolumeMl, titrantNormality } = input;
  const warnings: CalcWarning[] = [];
  const totalEndpointPh = input.totalEndpointPh ?? ENDPOINT_PH.routineTotal;
  const mg = (v: Decimal.Value) => alkalinityMgL({ titrantVolumeMl: v, titrantNormality, sampleVolumeMl, factor });
  const meq = (v: Decimal.Value) => alkalinityMeqL({ titrantVolumeMl: v, titrantNormality, sampleVolumeMl });

  let derived: Derived;
  if (input.readings) {
    derived = analyseReadings({ ...input, readings: input.readings }, totalEndpointPh, factor, warnings);
  } else if (input.lowAlkalinity) {
    const low = input.lowAlkalinity;
    const result = lowAlkalinityTwoPoint({ ...low, sampleVolumeMl, titrantNormality, factor });
    const pVolume = new Dec(input.volumeToPh83Ml ?? 0);
    derived = {
      pVolume,
      tVolume: result.equivalenceVolumeMl,
      pEndpoint: { volumeMl: n6(pVolume), pH: ENDPOINT_PH.phenolphthalein, method: 'fixed' },
      tEndpoint: { volumeMl: n6(result.equivalenceVolumeMl), pH: low.firstEndpointPh, method: 'two_point' },
      method: 'two_point',
      totalEndpointPh: low.firstEndpointPh,
      curve: null,
      lowAlkalinity: {
        equivalenceVolumeMl: n6(result.equivalenceVolumeMl),
        firstEndpointPh: low.firstEndpointPh,
        secondEndpointPh: result.secondEndpointPh,
      },
    };
    if (low.firstEndpointPh < 4.3 || low.firstEndpointPh > 4.7) {
      warnings.push(
        calcWarning(
          'first_endpoint_ph_outside_range',
          `The two-point method stops first between pH 4.3 and 4.7 (SM 2320 B ¶4d); ${low.firstEndpointPh} was used.`,
          'lowAlkalinity.firstEndpointPh',
        ),
      );
    }
    warnings.push(...titrantVolumeWarnings(low.volumeToSecondEndpointMl, 'lowAlkalinity.volumeToSecondEndpointMl', input.buretteResolutionMl ?? MICROBURET_RESOLUTION_ML));
  } else {
    // The schema guarantees both volumes in this mode.
    const pVolume = new Dec(input.volumeToPh83Ml as number);
    const tVolume = new Dec(input.volumeToTotalEndpointMl as number);
    derived = {
      pVolume,
      tVolume,
      pEndpoint: { volumeMl: n6(pVolume), pH: ENDPOINT_PH.phenolphthalein, method: 'fixed' },
      tEndpoint: { volumeMl: n6(tVolume), pH: totalEndpointPh, method: 'fixed' },
      method: 'fixed',
      totalEndpointPh,
      curve: null,
      lowAlkalinity: null,
    };
  }

  const p = mg(derived.pVolume);
  const t = mg(derived.tVolume);
  const pMeq = meq(derived.pVolume);
  const tMeq = meq(derived.tVolume);
  const species = ptSpecies(p, t);

  if (derived.method === 'fixed') {
    warnings.push(...endpointPhWarnings(totalEndpointPh, t.toNumber(), 'totalEndpointPh'));
  }
  if (derived.method !== 'two_point') {
    warnings.push(...titrantVolumeWarnings(derived.tVolume.toNumber(), input.readings ? 'readings' : 'volumeToTotalEndpointMl', input.buretteResolutionMl));
    if (t.gt(0) && t.lt(LOW_ALKALINITY_MGL)) {
      warnings.push(
        calcWarning(
          'low_alkalinity_method_advised',
          `Total alkalinity ${n6(t)} mg/L is below 20 mg/L; SM 2320 B ¶4d advises the two-point low-alkalinity method, since a fixed pH 4.5 endpoint reads high there.`,
        ),
      );
    }
  }
  const initialPh = input.initialPh ?? input.readings?.[0].pH;
  if (initialPh !== undefined && initialPh <= ENDPOINT_PH.phenolphthalein && p.gt(0)) {
    warnings.push(
      calcWarning(
        'phenolphthalein_alkalinity_with_low_ph',
        `P is ${n6(p)} mg/L although the sample starts at pH ${initialPh}; phenolphthalein alkalinity is zero at or below pH 8.3.`,
        input.readings ? 'initialPh' : 'volumeToPh83Ml',
      ),
    );
  }

  const speciesEquilibrium =
    initialPh === undefined
      ? null
      : equilibriumOut(initialPh, t.toNumber(), input.temperatureC, ionicStrengthOf(input), factor, warnings, input.initialPh === undefined ? 'readings' : 'initialPh');

  return {
    phenolphthaleinAlkalinity: n6(p),
    totalAlkalinity: n6(t),
    phenolphthaleinAlkalinityMeqL: n6(pMeq),
    totalAlkalinityMeqL: n6(tMeq),
    species: species.out,
    speciesEquilibrium,
    endpoints: { phenolphthalein: derived.pEndpoint, total: derived.tEndpoint },
    endpointMethod: derived.method,
    totalEndpointPh: derived.totalEndpointPh,
    recommendedTotalEndpointPh: recommendedTotalEndpointPh(t.toNumber()),
    caco3Factor: factor,
    curve: derived.curve,
    lowAlkalinity: derived.lowAlkalinity,
    constants: {
      caco3Factor: factor,
      caco3MgPerMeq: EQUIVALENT_WEIGHT.CaCO3,
      formula: derived.method === 'two_point' ? '(2B − C) × N × factor / V_s' : 'A × N × factor / V_s',
      source: 'SM 2320 B',
    },
    exact: {
      phenolphthaleinAlkalinity: p.toString(),
      totalAlkalinity: t.toString(),
      phenolphthaleinAlkalinityMeqL: pMeq.toString(),
      totalAlkalinityMeqL: tMeq.toString(),
      phenolphthaleinVolumeMl: derived.pVolume.toString(),
      totalVolumeMl: derived.tVolume.toString(),
      species: species.exact,
    },
    warnings,
  };
}

// ---------------------------------------------------------------------------------------------
// Acidity
// ---------------------------------------------------------------------------------------------

export interface AcidityResult {
  /** Acidity to pH 3.7, mg/L as CaCO3, signed; null when volumeToPh37Ml was not given. */
  mineralAcidity: number | null;
  /** Acidity to pH 8.3 (or the given endpoint), mg/L as CaCO3, signed. */
  totalAcidity: number;
  mineralAcidityMeqL: number | null;
  totalAcidityMeqL: number;
  /** Any result below zero: the sample had net alkalinity. */
  netAlkaline: boolean;
  /** False when a result is negative: not a compliance value; determine alkalinity instead. */
  reportable: boolean;
  endpoints: { mineral: { volumeMl: number; pH: number } | null; total: { volumeMl: number; pH: number } };
  peroxideTreatment: { acidVolumeMl: number; acidNormality: number; correctionMeq: number } | null;
  caco3Factor: Caco3Factor;
  constants: { caco3Factor: Caco3Factor; formula: string; source: string };
  exact: { mineralAcidity: string | null; totalAcidity: string; mineralAcidityMeqL: string | null; totalAcidityMeqL: string };
  warnings: CalcWarning[];
}

/** Acidity by POST /api/v1/calc/acidity: mineral (3.7) and total (8.3), peroxide correction, signed [SM 2310 B]. */
export function calculateAcidity(request: AcidityRequest): AcidityResult {
  const input = parseOrThrow(acidityRequestSchema, request);
  const factor: Caco3Factor = input.caco3Factor ?? DEFAULT_CACO3_FACTOR;
  const totalEndpointPh = input.totalEndpointPh ?? ENDPOINT_PH.totalAcidity;
  const pretreatment = input.peroxideTreatment;
  const run = (volume: number) =>
    acidityMgL({ titrantVolumeMl: volume, titrantNormality: input.titrantNormality, sampleVolumeMl: input.sampleVolumeMl, pretreatment, factor });
  const total = run(input.volumeToPh83Ml);
  const mineral = input.volumeToPh37Ml === undefined ? null : run(input.volumeToPh37Ml);
  const netAlkaline = total.netAlkaline || (mineral?.netAlkaline ?? false);
  const warnings: CalcWarning[] = [];
  if (netAlkaline) {
    warnings.push(
      calcWarning(
        'net_alkaline',
        'The acidity is negative: the sample had net alkalinity. Do not report a negative acidity as a compliance value; determine alkalinity by SM 2320 B instead.',
        total.netAlkaline ? 'volumeToPh83Ml' : 'volumeToPh37Ml',
      ),
    );
  }
  warnings.push(...titrantVolumeWarnings(input.volumeToPh83Ml, 'volumeToPh83Ml', input.buretteResolutionMl));
  return {
    mineralAcidity: mineral && n6(mineral.acidity),
    totalAcidity: n6(total.acidity),
    mineralAcidityMeqL: mineral && n6(mineral.acidityMeqL),
    totalAcidityMeqL: n6(total.acidityMeqL),
    netAlkaline,
    reportable: !netAlkaline,
    endpoints: {
      mineral: input.volumeToPh37Ml === undefined ? null : { volumeMl: input.volumeToPh37Ml, pH: ENDPOINT_PH.mineralAcidity },
      total: { volumeMl: input.volumeToPh83Ml, pH: totalEndpointPh },
    },
    peroxideTreatment: pretreatment
      ? { acidVolumeMl: pretreatment.acidVolumeMl, acidNormality: pretreatment.acidNormality, correctionMeq: n6(total.pretreatmentMeq) }
      : null,
    caco3Factor: factor,
    constants: { caco3Factor: factor, formula: '[(A × B) − (C × D)] × factor / V_s', source: 'SM 2310 B' },
    exact: {
      mineralAcidity: mineral && mineral.acidity.toString(),
      totalAcidity: total.acidity.toString(),
      mineralAcidityMeqL: mineral && mineral.acidityMeqL.toString(),
      totalAcidityMeqL: total.acidityMeqL.toString(),
    },
    warnings,
  };
}

// ---------------------------------------------------------------------------------------------
// Speciation
// ---------------------------------------------------------------------------------------------

export interface SpeciationResult {
  /** From pH, temperature and T (USGS NFM 6.6.5.B; SM 2330). */
  equilibrium: EquilibriumSpeciesOut;
  /** From P and T when P is given (SM 2320 B Table 2320:II). */
  fromPT: PtSpeciesOut | null;
  /** 50,000 × 10^(pH − pKw), mg/L as CaCO3, no activity correction (SM 2320 B). */
  hydroxideFromPh: number;
  warnings: CalcWarning[];
}

/** Speciation by POST /api/v1/calc/speciation [USGS NFM 6.6.5.B; SM 2330; SM 2320 B]. */
export function calculateSpeciation(request: SpeciationRequest): SpeciationResult {
  const input = parseOrThrow(speciationRequestSchema, request);
  const warnings: CalcWarning[] = [];
  // Without a stated factor the equilibrium method's own 50.04 mg/meq converts T to eq/L.
  const caco3MgPerEq = input.caco3Factor ?? CACO3_MG_PER_EQ;
  const equilibrium = equilibriumOut(input.pH, input.totalAlkalinity, input.temperatureC, ionicStrengthOf(input), caco3MgPerEq, warnings);
  return {
    equilibrium,
    fromPT: input.phenolphthaleinAlkalinity === undefined ? null : ptSpecies(new Dec(input.phenolphthaleinAlkalinity), new Dec(input.totalAlkalinity)).out,
    hydroxideFromPh: n6(hydroxideFromPh(input.pH, input.temperatureC ?? 25, input.caco3Factor ?? DEFAULT_CACO3_FACTOR)),
    warnings,
  };
}

// ---------------------------------------------------------------------------------------------
// Titration curve model
// ---------------------------------------------------------------------------------------------

export interface EndpointErrorOut {
  endpointPh: number;
  endpointVolumeMl: number;
  equivalence: EquivalenceName;
  equivalenceVolumeMl: number;
  equivalencePh: number;
  errorMl: number;
  errorMgL: number;
  errorPercent: number;
  trueResultMgL: number;
  endpointResultMgL: number;
}

export interface CurveResult {
  points: Reading[];
  derivative: DerivativePoint[];
  equivalencePoints: Array<{ name: EquivalenceName; volumeMl: number; pH: number }>;
  endpointErrors: EndpointErrorOut[];
  model: {
    sampleType: 'carbonate' | 'strongAcid' | 'strongBase';
    titrant: Titrant;
    titrantNormality: number;
    sampleVolumeMl: number;
    initialPh: number;
    /** Net strong base S0, eq/L (= total alkalinity of a carbonate water; −mineral acidity of an acid sample). */
    strongBaseEqL: number;
    totalCarbonateMmolL: number;
    description: string;
    activity: ActivityOut;
    constants: ConstantsOut;
  };
  caco3Factor: Caco3Factor;
  warnings: CalcWarning[];
}

const DEFAULT_CURVE_INTERVALS = 100;
/** Grid extent past the last equivalence point, as a multiple of its volume. */
const CURVE_OVERRUN = 1.5;

/** Titration-curve model by POST /api/v1/calc/curve: points, equivalence points, endpoint errors [charge balance; SM 2320 B]. */
export function calculateCurve(request: CurveRequest): CurveResult {
  const input = parseOrThrow(curveRequestSchema, request);
  const warnings: CalcWarning[] = [];
  const factor: Caco3Factor = input.caco3Factor ?? DEFAULT_CACO3_FACTOR;
  const sampleType = input.sampleType ?? 'carbonate';
  const titrant: Titrant = input.titrant ?? (sampleType === 'strongAcid' ? 'base' : 'acid');
  const strength = ionicStrengthOf(input);
  if (input.temperatureC === undefined) {
    warnings.push(calcWarning('temperature_assumed', 'No temperature given; the model uses 25 °C.', 'temperatureC'));
  }
  const spec = {
    sampleVolumeMl: input.sampleVolumeMl,
    titrant,
    titrantNormality: input.titrantNormality,
    temperatureC: input.temperatureC ?? 25,
    ionicStrength: strength.ionicStrength,
  };
  let model: TitrationModel;
  if (sampleType === 'strongAcid') model = strongAcidModel({ ...spec, concentrationM: input.concentrationM as number });
  else if (sampleType === 'strongBase') model = strongBaseModel({ ...spec, concentrationM: input.concentrationM as number });
  else if (input.totalAlkalinity !== undefined) {
    model = carbonateWaterModel({ ...spec, initialPh: input.initialPh as number, alkalinityEqL: input.totalAlkalinity / factor });
  } else {
    model = carbonateModelFromTotalCarbonate({ ...spec, initialPh: input.initialPh as number, totalCarbonateM: (input.totalCarbonateMmolL as number) / 1000 });
  }

  const equivalence = equivalencePoints(model);
  const startPh = modelCurve(model, [0])[0].pH;
  const defaultEndpoints =
    titrant === 'acid'
      ? [ENDPOINT_PH.phenolphthalein, ENDPOINT_PH.routineTotal].filter((pH) => startPh > pH)
      : [ENDPOINT_PH.mineralAcidity, ENDPOINT_PH.totalAcidity].filter((pH) => startPh < pH);
  const endpointPhs = input.endpointPh ?? (equivalence.length ? defaultEndpoints : []);
  const errors = endpointPhs.map((pH, i) =>
    endpointError(model, pH, { factor, field: input.endpointPh ? `endpointPh.${i}` : 'endpointPh' }),
  );

  let volumes: number[];
  if (input.volumesMl) volumes = input.volumesMl;
  else {
    const furthest = Math.max(0, ...equivalence.map((e) => e.volumeMl), ...errors.map((e) => e.endpointVolumeMl));
    const maxVolumeMl = input.maxVolumeMl ?? (furthest > 0 ? furthest * CURVE_OVERRUN : 25);
    volumes = volumeGrid(maxVolumeMl, input.intervals ?? DEFAULT_CURVE_INTERVALS, [
      ...equivalence.map((e) => e.volumeMl),
      ...errors.map((e) => e.endpointVolumeMl),
    ]);
  }
  const points = modelCurve(model, volumes).map((p) => ({ volumeMl: n6(p.volumeMl), pH: n6(p.pH) }));

  const description =
    sampleType === 'carbonate'
      ? `closed carbonate system, ${titrant === 'acid' ? 'strong acid' : 'strong base'} titrant, with dilution`
      : `${sampleType === 'strongAcid' ? 'strong acid' : 'strong base'} sample, ${titrant === 'acid' ? 'strong acid' : 'strong base'} titrant, with dilution`;
  return {
    points,
    derivative: derivativeSeries(points).map((d) => ({ volumeMl: n6(d.volumeMl), pH: n6(d.pH), slope: n6(d.slope) })),
    equivalencePoints: equivalence.map((e) => ({ name: e.name, volumeMl: n6(e.volumeMl), pH: n6(e.pH) })),
    endpointErrors: errors.map((e) => ({
      endpointPh: e.endpointPh,
      endpointVolumeMl: n6(e.endpointVolumeMl),
      equivalence: e.equivalence.name,
      equivalenceVolumeMl: n6(e.equivalence.volumeMl),
      equivalencePh: n6(e.equivalence.pH),
      errorMl: n6(e.errorMl),
      errorMgL: n6(e.errorMgL),
      errorPercent: n6(e.errorPercent),
      trueResultMgL: n6(e.trueResultMgL),
      endpointResultMgL: n6(e.endpointResultMgL),
    })),
    model: {
      sampleType,
      titrant,
      titrantNormality: input.titrantNormality,
      sampleVolumeMl: input.sampleVolumeMl,
      initialPh: n6(startPh),
      strongBaseEqL: n6(model.strongBaseEqL),
      totalCarbonateMmolL: n6(model.totalCarbonateM * 1000),
      description,
      activity: activityOut(model.activity, strength.source),
      constants: constantsOut(model.constants),
    },
    caco3Factor: factor,
    warnings,
  };
}

// ---------------------------------------------------------------------------------------------
// Langelier and Ryznar
// ---------------------------------------------------------------------------------------------

export interface LsiResult {
  /** pHs, LSI and RSI from the exact SM 2330 B form. */
  pHs: number;
  langelierIndex: number;
  ryznarIndex: number;
  tendency: { langelier: LsiTendency; ryznar: RsiTendency; note: string };
  exact: {
    method: string;
    ionicStrength: number;
    ionicStrengthSource: IonicStrengthSource;
    debyeHuckelA: number;
    debyeHuckelASource: string;
    pfm: number;
    pK2MinusPKs: number;
    pCa: number;
    pHco3: number;
    pHs: number;
    langelierIndex: number;
    ryznarIndex: number;
    calciteSaturationIndex: number;
  };
  approximate: { method: string; A: number; B: number; C: number; D: number; pHs: number; langelierIndex: number; ryznarIndex: number };
  temperatureC: number;
  constants: ConstantsOut;
  warnings: CalcWarning[];
}

/** LSI (exact SM 2330 B and the Carrier/Roberge approximation) and Ryznar index by POST /api/v1/calc/lsi [Langelier 1936; Ryznar 1944]. */
export function calculateLsi(request: LsiRequest): LsiResult {
  const input = parseOrThrow(lsiRequestSchema, request);
  const warnings: CalcWarning[] = [];
  if (input.temperatureC === undefined) {
    warnings.push(calcWarning('temperature_assumed', 'No temperature given; 25 °C is used.', 'temperatureC'));
  }
  const temperatureC = input.temperatureC ?? 25;
  const strength = input.ionicStrength === undefined
    ? { ionicStrength: ionicStrengthFromTds(input.tdsMgL), source: 'tds' as const }
    : { ionicStrength: input.ionicStrength, source: 'given' as const };
  if (strength.ionicStrength > DAVIES_WARNING_IONIC_STRENGTH) {
    warnings.push(calcWarning('ionic_strength_high', `Ionic strength ${n6(strength.ionicStrength)} mol/L is above 0.1, where the Davies equation loses accuracy.`));
  }
  const common = { pH: input.pH, temperatureC, calciumHardnessMgL: input.calciumHardness, alkalinityMgL: input.totalAlkalinity };
  const exact = langelierExact({ ...common, ionicStrength: strength.ionicStrength });
  const approx = langelierApproximate({ ...common, tdsMgL: input.tdsMgL });
  const rsiExact = ryznarIndex(exact.pHs, input.pH);
  return {
    pHs: n6(exact.pHs),
    langelierIndex: n6(exact.lsi),
    ryznarIndex: n6(rsiExact),
    tendency: {
      langelier: lsiTendency(exact.lsi),
      ryznar: rsiTendency(rsiExact),
      note: 'Saturation indices are guides, not absolutes, and do not predict lead or copper release (SM 2330 A).',
    },
    exact: {
      method: 'pHs = pK2 − pKs + p[Ca] + p[HCO3] + 5 pfm (SM 2330 B)',
      ionicStrength: n6(exact.ionicStrength),
      ionicStrengthSource: strength.source,
      debyeHuckelA: n6(exact.debyeHuckelA),
      debyeHuckelASource: DEBYE_HUCKEL_A_SOURCE,
      pfm: n6(exact.pfm),
      pK2MinusPKs: n6(exact.pK2MinusPKs),
      pCa: n6(exact.pCa),
      pHco3: n6(exact.pHco3),
      pHs: n6(exact.pHs),
      langelierIndex: n6(exact.lsi),
      ryznarIndex: n6(rsiExact),
      calciteSaturationIndex: n6(exact.calciteSaturationIndex),
    },
    approximate: {
      method: 'pHs = (9.3 + A + B) − (C + D) (Roberge 2008, eqs 8.26–8.31; Carrier 1965)',
      A: n6(approx.A),
      B: n6(approx.B),
      C: n6(approx.C),
      D: n6(approx.D),
      pHs: n6(approx.pHs),
      langelierIndex: n6(approx.lsi),
      ryznarIndex: n6(ryznarIndex(approx.pHs, input.pH)),
    },
    temperatureC,
    constants: constantsOut(exact.constants),
    warnings,
  };
}
