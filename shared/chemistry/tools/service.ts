import { inputError } from '../../errors';
import { parseOrThrow } from '../../schemas/parse';
import {
  alkalinityDoseRequestSchema,
  ccppRequestSchema,
  digesterRequestSchema,
  endpointErrorRequestSchema,
  nitrificationRequestSchema,
  tocRemovalRequestSchema,
  type AlkalinityDoseRequest,
  type CcppRequest,
  type DigesterRequest,
  type EndpointErrorRequest,
  type NitrificationRequest,
  type TocRemovalRequest,
} from '../../schemas/tools';
import { recommendedTotalEndpointPh } from '../alkalinity';
import { DEFAULT_CACO3_FACTOR, ENDPOINT_PH, type Caco3Factor } from '../constants';
import {
  carbonateWaterModel,
  endpointError,
  equivalencePoints,
  modelCurve,
  modelPh,
  volumeGrid,
  type EquivalenceName,
  type EquivalencePoint,
  type TitrationModel,
} from '../curve';
import { derivativeSeries, type DerivativePoint, type Reading } from '../endpoints';
import { calculateLsi, type LsiResult } from '../service';
import { ionicStrengthFromTds } from '../speciation';
import { toApiNumber } from '../rounding';
import { ALKALINITY_CHEMICALS, alkalinityDose, DOSING_CAUTIONS, type AlkalinityChemical } from './alkalinityDose';
import { CCPP_BANDS, classify, DIGESTER_BANDS, LSI_BANDS, roundTo, RSI_BANDS, type BandLevel, type BandScale } from './bands';
import { calciumCarbonatePrecipitationPotential } from './corrosionIndices';
import { endpointSteepness, INDICATORS, indicatorsAt, STEEP_DEFINITION, STEEP_FRACTION, steepPart, type IndicatorKey, type SteepPart } from './curveInsight';
import { digesterHealth, type RatioTrend } from './digester';
import {
  ALKALINITY_COLUMNS,
  removalRatio,
  requiredTocRemoval,
  STEP1_MIN_TOC_MGL,
  TOC_ROWS,
  tocRemovalPercent,
  type AlkalinityColumn,
  type TocRow,
} from './enhancedCoagulation';
import {
  ALKALINITY_PER_NH4N_NITRIFIED,
  ALKALINITY_PER_NO3N_DENITRIFIED,
  nitrificationBudget,
} from './nitrification';
import { celsiusToFahrenheit, fahrenheitToCelsius, feedRate, flowOf, LB_PER_MG_PER_MGL, type FeedRate, type Flow } from './units';
import { sig6, toolWarning, type ToolWarning } from './warnings';

/**
 * The tools' calculation API (POST /api/v1/calc/ccpp, toc-removal, nitrification,
 * alkalinity-dose, digester, endpoint-error). Each function validates its own input with the
 * shared schema (InputError with field reasons), so a route passes the body straight in and
 * the browser runs the same code as the user types. Numbers carry 6 significant figures.
 */

export interface BandOut {
  key: string;
  label: string;
  meaning: string;
  level: BandLevel;
  source: string;
}

function bandOut(scale: BandScale, value: number): BandOut {
  const b = classify(scale, value);
  return { key: b.key, label: b.label, meaning: b.meaning, level: b.level, source: scale.source };
}

/** Davies is trusted to about I = 0.1 here [Davies 1962: suitable to about 0.1–0.5]. */
const DAVIES_WARNING_IONIC_STRENGTH = 0.1;

function temperatureOf(input: { temperatureC?: number; temperatureF?: number }, warnings: ToolWarning[]): number {
  if (input.temperatureC !== undefined) return input.temperatureC;
  if (input.temperatureF !== undefined) return fahrenheitToCelsius(input.temperatureF);
  warnings.push(toolWarning('temperature_assumed', 'No temperature given; 25 °C (77 °F) is used.', 'temperatureC'));
  return 25;
}

// ---------------------------------------------------------------------------------------------
// Corrosion: CCPP, and LSI/RSI with their bands
// ---------------------------------------------------------------------------------------------

export interface CcppApiResult {
  /** mg/L as CaCO3: positive would precipitate, negative would dissolve. */
  ccpp: number;
  band: BandOut;
  signConvention: string;
  precipitatedMmolL: number;
  initial: { pH: number; calciumHardness: number; totalAlkalinity: number; totalCarbonateMmolL: number; saturationIndex: number };
  final: { pH: number; calciumHardness: number; totalAlkalinity: number; totalCarbonateMmolL: number; saturationIndex: number };
  temperatureC: number;
  temperatureF: number;
  ionicStrength: number;
  ionicStrengthSource: 'tds' | 'given';
  procedure: string;
  warnings: ToolWarning[];
}

/** CCPP by POST /api/v1/calc/ccpp: closed system, I constant, bisection on x [SM 2330; DIN 38404-10; domain.md 8.3]. */
export function calculateCcpp(request: CcppRequest): CcppApiResult {
  const input = parseOrThrow(ccppRequestSchema, request);
  const warnings: ToolWarning[] = [];
  const temperatureC = temperatureOf(input, warnings);
  const ionicStrength = input.ionicStrength ?? ionicStrengthFromTds(input.tdsMgL);
  if (ionicStrength > DAVIES_WARNING_IONIC_STRENGTH) {
    warnings.push(toolWarning('ionic_strength_high', `Ionic strength ${sig6(ionicStrength)} mol/L is above 0.1, where the Davies equation loses accuracy.`));
  }
  const r = calciumCarbonatePrecipitationPotential({
    pH: input.pH,
    temperatureC,
    calciumHardnessMgL: input.calciumHardness,
    alkalinityMgL: input.totalAlkalinity,
    ionicStrength,
  });
  return {
    ccpp: sig6(r.ccppMgL),
    // Classified as reported, to 0.1 mg/L.
    band: bandOut(CCPP_BANDS, roundTo(r.ccppMgL, 1)),
    signConvention: 'Positive: CaCO3 would precipitate; negative: it would dissolve (SM 2330). The marble test reports the opposite sign.',
    precipitatedMmolL: sig6(r.precipitatedMolL * 1000),
    initial: {
      pH: input.pH,
      calciumHardness: input.calciumHardness,
      totalAlkalinity: input.totalAlkalinity,
      totalCarbonateMmolL: sig6(r.initialTotalCarbonateMmolL),
      saturationIndex: sig6(r.initialSaturationIndex),
    },
    final: {
      pH: sig6(r.finalPh),
      calciumHardness: sig6(r.finalCalciumHardnessMgL),
      totalAlkalinity: sig6(r.finalAlkalinityMgL),
      totalCarbonateMmolL: sig6(r.finalTotalCarbonateMmolL),
      // Zero to solver precision; rounded so that −3e−15 does not read as a tendency.
      saturationIndex: roundTo(r.finalSaturationIndex, 6),
    },
    temperatureC: sig6(temperatureC),
    temperatureF: sig6(celsiusToFahrenheit(temperatureC)),
    ionicStrength: sig6(ionicStrength),
    ionicStrengthSource: input.ionicStrength === undefined ? 'tds' : 'given',
    procedure: `Closed system (no exchange with air CO2), ionic strength held at ${sig6(ionicStrength)} mol/L, ${sig6(temperatureC)} °C; Plummer and Busenberg (1982) constants, Davies activity coefficients. Open-system and high-temperature CCPP can differ a lot (Tang et al. 2021).`,
    warnings,
  };
}

export interface CorrosionIndicesResult {
  /** The /calc/lsi answer, unchanged. */
  lsi: LsiResult;
  interpretation: {
    langelier: BandOut;
    ryznar: BandOut;
    approximateLangelier: BandOut;
    approximateRyznar: BandOut;
  };
  ccpp: CcppApiResult;
  temperatureC: number;
  temperatureF: number;
  warnings: ToolWarning[];
}

/** LSI and RSI (the /calc/lsi engine) with interpretation bands, plus CCPP, for the corrosion page [Langelier 1936; Ryznar 1944; SM 2330]. */
export function calculateCorrosionIndices(request: CcppRequest): CorrosionIndicesResult {
  const input = parseOrThrow(ccppRequestSchema, request);
  const warnings: ToolWarning[] = [];
  const temperatureC = temperatureOf(input, warnings);
  const lsi = calculateLsi({
    pH: input.pH,
    temperatureC,
    tdsMgL: input.tdsMgL,
    calciumHardness: input.calciumHardness,
    totalAlkalinity: input.totalAlkalinity,
    ...(input.ionicStrength === undefined ? {} : { ionicStrength: input.ionicStrength }),
  });
  // The CCPP run repeats the temperature warning; keep one.
  const ccpp = calculateCcpp({ ...input, temperatureC, temperatureF: undefined });
  // Indices are reported to 0.01 and classified as reported.
  return {
    lsi,
    interpretation: {
      langelier: bandOut(LSI_BANDS, roundTo(lsi.langelierIndex, 2)),
      ryznar: bandOut(RSI_BANDS, roundTo(lsi.ryznarIndex, 2)),
      approximateLangelier: bandOut(LSI_BANDS, roundTo(lsi.approximate.langelierIndex, 2)),
      approximateRyznar: bandOut(RSI_BANDS, roundTo(lsi.approximate.ryznarIndex, 2)),
    },
    ccpp,
    temperatureC: sig6(temperatureC),
    temperatureF: sig6(celsiusToFahrenheit(temperatureC)),
    warnings: [...warnings, ...ccpp.warnings],
  };
}

// ---------------------------------------------------------------------------------------------
// Enhanced coagulation
// ---------------------------------------------------------------------------------------------

export interface TocRemovalResult {
  /** Step 1 required removal, %; null when source TOC ≤ 2.0 mg/L. */
  requiredRemovalPercent: number | null;
  step1Applies: boolean;
  row: { key: TocRow; label: string } | null;
  column: { key: AlkalinityColumn; label: string };
  softening: boolean;
  /** (source − treated)/source × 100, when treated TOC is given. */
  achievedRemovalPercent: number | null;
  /** achieved ÷ required. */
  removalRatio: number | null;
  meetsStep1: boolean | null;
  status: BandOut | null;
  exact: { achievedRemovalPercent: string | null; removalRatio: string | null };
  source: string;
  notes: string[];
  warnings: ToolWarning[];
}

const TOC_SOURCE = '40 CFR 141.135(b)(2), Step 1 TOC removal table (also NH Env-Ws 382.23)';

/** Step 1 TOC removal required, achieved and their ratio by POST /api/v1/calc/toc-removal [40 CFR 141.135(b)(2), (c)]. */
export function calculateTocRemoval(request: TocRemovalRequest): TocRemovalResult {
  const input = parseOrThrow(tocRemovalRequestSchema, request);
  const warnings: ToolWarning[] = [];
  const notes: string[] = [
    'The monthly removal ratio is the actual % removal ÷ the required % removal; compliance is a running annual average of the monthly ratios, computed quarterly, of at least 1.00 (40 CFR 141.135(c)).',
    'Systems that cannot meet Step 1 may set an alternative (Step 2) requirement by jar or pilot testing (40 CFR 141.135(b)(4)).',
    'The permit, the primacy agency’s rules and licensed practice govern; this is a calculation aid.',
  ];
  const req = requiredTocRemoval(input);
  const row = req.row === null ? null : { key: req.row, label: TOC_ROWS.find((r) => r.key === req.row)!.label };
  const column = { key: req.column, label: ALKALINITY_COLUMNS.find((c) => c.key === req.column)!.label };
  if (req.requiredPercent === null) {
    warnings.push(
      toolWarning(
        'step1_not_required',
        `Source TOC ${input.sourceTocMgL} mg/L is not above 2.0 mg/L: the Step 1 table sets no removal requirement (a source TOC below 2.0 mg/L, as a running annual average, is also an alternative compliance criterion, 40 CFR 141.135(a)(2)).`,
        'sourceTocMgL',
      ),
    );
  }
  let achieved: ReturnType<typeof tocRemovalPercent> | null = null;
  let ratio: ReturnType<typeof removalRatio> | null = null;
  if (input.treatedTocMgL !== undefined) {
    if (!(input.sourceTocMgL > 0)) throw inputError('sourceTocMgL', 'must be greater than 0 to compute the removal achieved');
    achieved = tocRemovalPercent(input.sourceTocMgL, input.treatedTocMgL);
    if (achieved.isNegative()) {
      warnings.push(toolWarning('negative_removal', 'Treated TOC is higher than source TOC: the removal is negative. Check the samples and their pairing.', 'treatedTocMgL'));
    }
    if (input.treatedTocMgL < STEP1_MIN_TOC_MGL) {
      warnings.push(
        toolWarning(
          'alternative_compliance_possible',
          'Treated TOC is below 2.0 mg/L: as a running annual average that is an alternative compliance criterion (40 CFR 141.135(a)(2)).',
          'treatedTocMgL',
        ),
      );
    }
    if (req.requiredPercent !== null) ratio = removalRatio(achieved, req.requiredPercent);
  }
  const meetsStep1 = ratio === null ? null : ratio.gte(1);
  return {
    requiredRemovalPercent: req.requiredPercent,
    step1Applies: req.requiredPercent !== null,
    row,
    column,
    softening: req.softening,
    achievedRemovalPercent: achieved && toApiNumber(achieved),
    removalRatio: ratio && toApiNumber(ratio),
    meetsStep1,
    status:
      meetsStep1 === null
        ? null
        : meetsStep1
          ? { key: 'meets', label: 'Meets Step 1', meaning: 'Removal ratio of at least 1.00 this month', level: 'ok', source: TOC_SOURCE }
          : { key: 'below', label: 'Below Step 1', meaning: 'Removal ratio below 1.00 this month', level: 'act', source: TOC_SOURCE },
    exact: { achievedRemovalPercent: achieved && achieved.toString(), removalRatio: ratio && ratio.toString() },
    source: TOC_SOURCE,
    notes,
    warnings,
  };
}

// ---------------------------------------------------------------------------------------------
// Alkalinity dose
// ---------------------------------------------------------------------------------------------

export interface AlkalinityDoseResult {
  chemical: AlkalinityChemical;
  name: string;
  formula: string;
  /** g/eq. */
  equivalentWeight: number;
  /** mg chemical per mg/L of alkalinity as CaCO3. */
  mgPerMgAlkalinity: number;
  /** mg/L as CaCO3. */
  alkalinityIncrease: number;
  purityPercent: number;
  dose: { pureMgL: number; productMgL: number };
  flow: { mgd: number; m3PerDay: number; given: Flow['given'] } | null;
  feed: { pure: FeedRate; product: FeedRate } | null;
  factors: { caco3MgPerMeq: number; lbPerMgPerMgL: number; source: string };
  cautions: string[];
}

function feedOut(f: FeedRate): FeedRate {
  return { kgPerDay: sig6(f.kgPerDay), lbPerDay: sig6(f.lbPerDay) };
}

function doseOut(chemical: AlkalinityChemical, alkalinityIncrease: number, purityPercent: number, flow: Flow | null): AlkalinityDoseResult {
  const d = alkalinityDose({ chemical, alkalinityIncrease, purityPercent, flow });
  const info = ALKALINITY_CHEMICALS[chemical];
  return {
    chemical,
    name: info.name,
    formula: info.formula,
    equivalentWeight: info.equivalentWeight,
    mgPerMgAlkalinity: sig6(d.mgPerMgAlkalinity),
    alkalinityIncrease: sig6(alkalinityIncrease),
    purityPercent,
    dose: { pureMgL: sig6(d.pureMgL), productMgL: sig6(d.productMgL) },
    flow: flow && { mgd: sig6(flow.mgd), m3PerDay: sig6(flow.m3PerDay), given: flow.given },
    feed: d.pure && d.product ? { pure: feedOut(d.pure), product: feedOut(d.product) } : null,
    factors: {
      caco3MgPerMeq: 50.04,
      lbPerMgPerMgL: LB_PER_MG_PER_MGL,
      source: 'mg chemical per mg/L as CaCO3 = equivalent weight ÷ 50.04 (domain.md 8.5); lb/d = mg/L × MGD × 8.34; kg/d = mg/L × m³/d ÷ 1000',
    },
    cautions: [...info.cautions, ...DOSING_CAUTIONS],
  };
}

/** Chemical dose to raise alkalinity by POST /api/v1/calc/alkalinity-dose: mg/L, kg/d, lb/d [domain.md 8.5; 7.1]. */
export function calculateAlkalinityDose(request: AlkalinityDoseRequest): AlkalinityDoseResult {
  const input = parseOrThrow(alkalinityDoseRequestSchema, request);
  const increase = input.alkalinityIncrease ?? (input.targetAlkalinity as number) - (input.currentAlkalinity as number);
  return doseOut(input.chemical, increase, input.purityPercent ?? 100, flowOf(input));
}

// ---------------------------------------------------------------------------------------------
// Nitrification budget
// ---------------------------------------------------------------------------------------------

export interface NitrificationResult {
  /** mg/L as CaCO3. */
  influentAlkalinity: number;
  consumed: number;
  recovered: number;
  residual: number;
  residualMeqL: number;
  targetResidual: number;
  shortfall: number;
  meetsTarget: boolean;
  status: BandOut;
  factors: { perNh4NNitrified: number; perNo3NDenitrified: number; source: string };
  /** Chemical to make up the shortfall; null when there is none. */
  makeUp: AlkalinityDoseResult | null;
  flow: { mgd: number; m3PerDay: number; given: Flow['given'] } | null;
  /** Daily loads at the flow (alkalinity as CaCO3, nitrogen as N). */
  loads: { nh4NNitrified: FeedRate; alkalinityConsumed: FeedRate; alkalinityRecovered: FeedRate; shortfall: FeedRate } | null;
  warnings: ToolWarning[];
}

const NITRIFICATION_SOURCE =
  '7.14 mg as CaCO3 per mg NH4-N nitrified, 3.57 per mg NO3-N denitrified (EPA Nitrogen Control Manual, 1993, from memory; 2 × 50.04/14.007 = 7.145 by stoichiometry); target about 50 mg/L (common practice)';

/** Alkalinity budget of nitrification/denitrification and the make-up dose by POST /api/v1/calc/nitrification [EPA 1993, from memory; domain.md 8.4, 8.5]. */
export function calculateNitrification(request: NitrificationRequest): NitrificationResult {
  const input = parseOrThrow(nitrificationRequestSchema, request);
  const warnings: ToolWarning[] = [];
  const b = nitrificationBudget(input);
  const denitrified = input.denitrifiedNo3NMgL ?? 0;
  if (denitrified > input.nitrifiedNh4NMgL) {
    warnings.push(
      toolWarning(
        'denitrified_exceeds_nitrified',
        'More nitrate-N is denitrified than ammonia-N nitrified: only right when the influent carries nitrate of its own. Check the figures.',
        'denitrifiedNo3NMgL',
      ),
    );
  }
  if (b.residualMgL < 0) {
    warnings.push(
      toolWarning('alkalinity_exhausted', 'The budget goes below zero: the alkalinity runs out before nitrification is complete, and the pH will fall sharply.', 'nitrifiedNh4NMgL'),
    );
  }
  const flow = flowOf(input);
  const chemical = input.chemical ?? 'caustic_soda';
  const status: BandOut =
    b.residualMgL < 0
      ? { key: 'exhausted', label: 'Exhausted', meaning: 'Alkalinity runs out: nitrification stalls and the pH falls', level: 'act', source: NITRIFICATION_SOURCE }
      : b.meetsTarget
        ? { key: 'meets_target', label: 'Meets target', meaning: `Residual at or above ${b.targetResidualMgL} mg/L as CaCO3`, level: 'ok', source: NITRIFICATION_SOURCE }
        : { key: 'below_target', label: 'Below target', meaning: `Residual under ${b.targetResidualMgL} mg/L as CaCO3: add alkalinity`, level: 'caution', source: NITRIFICATION_SOURCE };
  return {
    influentAlkalinity: input.influentAlkalinity,
    consumed: sig6(b.consumedMgL),
    recovered: sig6(b.recoveredMgL),
    residual: sig6(b.residualMgL),
    residualMeqL: sig6(b.residualMgL / 50.04),
    targetResidual: b.targetResidualMgL,
    shortfall: sig6(b.shortfallMgL),
    meetsTarget: b.meetsTarget,
    status,
    factors: { perNh4NNitrified: ALKALINITY_PER_NH4N_NITRIFIED, perNo3NDenitrified: ALKALINITY_PER_NO3N_DENITRIFIED, source: NITRIFICATION_SOURCE },
    makeUp: b.shortfallMgL > 0 ? doseOut(chemical, b.shortfallMgL, input.purityPercent ?? 100, flow) : null,
    flow: flow && { mgd: sig6(flow.mgd), m3PerDay: sig6(flow.m3PerDay), given: flow.given },
    loads: flow && {
      nh4NNitrified: feedOut(feedRate(input.nitrifiedNh4NMgL, flow)),
      alkalinityConsumed: feedOut(feedRate(b.consumedMgL, flow)),
      alkalinityRecovered: feedOut(feedRate(b.recoveredMgL, flow)),
      shortfall: feedOut(feedRate(b.shortfallMgL, flow)),
    },
    warnings,
  };
}


// ---------------------------------------------------------------------------------------------
// Digester
// ---------------------------------------------------------------------------------------------

export interface DigesterResult {
  ratio: number;
  band: BandOut;
  trend: RatioTrend;
  targetRatio: number;
  /** Alkalinity for the target ratio at the same VA, mg/L as CaCO3, and how much more that is. */
  alkalinityForTarget: number;
  additionalAlkalinity: number;
  note: string;
  warnings: ToolWarning[];
}

/** Top of the stable band, the default aim for the alkalinity-needed figure [common practice]. */
const DEFAULT_TARGET_RATIO = 0.25;

/** Digester VA/alkalinity ratio with guidance bands and trend by POST /api/v1/calc/digester [Gerardi 2003; common practice]. */
export function calculateDigester(request: DigesterRequest): DigesterResult {
  const input = parseOrThrow(digesterRequestSchema, request);
  const warnings: ToolWarning[] = [];
  const targetRatio = input.targetRatio ?? DEFAULT_TARGET_RATIO;
  const h = digesterHealth({ volatileAcidsMgL: input.volatileAcidsMgL, alkalinity: input.alkalinity, previousRatios: input.previousRatios, targetRatio });
  if (h.trend === 'rising') {
    warnings.push(toolWarning('ratio_rising', 'The ratio has risen at each of the last results: a rising trend calls for corrective action before the pH moves (pH is the last indicator to change).', 'previousRatios'));
  }
  return {
    ratio: sig6(h.ratio),
    band: bandOut(DIGESTER_BANDS, h.ratio),
    trend: h.trend,
    targetRatio,
    alkalinityForTarget: sig6(h.alkalinityForTarget),
    additionalAlkalinity: sig6(h.additionalAlkalinity),
    note: 'VA as mg/L acetic acid ÷ alkalinity as mg/L CaCO3. FOS/TAC (pH 5.0 and 4.4) and IA/PA (pH 5.75 and 4.3) are different ratios: never compare them with this one.',
    warnings,
  };
}

// ---------------------------------------------------------------------------------------------
// Curve insight: endpoint error against the true equivalence points
// ---------------------------------------------------------------------------------------------

export type EndpointKind = 'phenolphthalein' | 'total';

export interface EndpointInsight {
  kind: EndpointKind;
  endpointPh: number;
  /** False for a P endpoint when the sample starts at or below it (P is zero by definition). */
  applicable: boolean;
  note: string | null;
  equivalence: EquivalenceName;
  equivalenceVolumeMl: number | null;
  equivalencePh: number | null;
  endpointVolumeMl: number | null;
  /** Endpoint − equivalence: positive reads high. */
  errorMl: number | null;
  errorMgL: number | null;
  errorMeqL: number | null;
  errorPercent: number | null;
  trueResultMgL: number | null;
  endpointResultMgL: number | null;
  /** |dpH/dV| at the endpoint, pH per mL, its fraction of the peak and the mL a 0.1 pH misreading costs there. */
  slopePhPerMl: number | null;
  slopeFractionOfPeak: number | null;
  volumePerTenthPhMl: number | null;
  steep: boolean | null;
  /** Indicators whose colour change spans this endpoint pH. */
  indicators: IndicatorKey[];
}

export interface EquivalenceInsight {
  name: EquivalenceName;
  volumeMl: number;
  pH: number;
  resultMgL: number;
  steepPart: { highPh: number; lowPh: number; highVolumeMl: number; lowVolumeMl: number; peakPh: number; peakVolumeMl: number; maxSlopePhPerMl: number } | null;
  indicators: IndicatorKey[];
}

export interface EndpointErrorResult {
  curve: { points: Reading[]; derivative: DerivativePoint[] };
  equivalencePoints: EquivalenceInsight[];
  endpoints: EndpointInsight[];
  recommendedTotalEndpointPh: number;
  recommendedSource: string;
  /** The total endpoint error had the recommended pH been used. */
  atRecommendedEndpoint: EndpointInsight | null;
  indicators: Array<{ key: IndicatorKey; name: string; fromPh: number; toPh: number; colourChange: string; use: string }>;
  steepDefinition: string;
  steepFraction: number;
  model: {
    description: string;
    totalCarbonateMmolL: number;
    initialPh: number;
    temperatureC: number;
    ionicStrength: number;
    caco3Factor: Caco3Factor;
  };
  warnings: ToolWarning[];
}

const CURVE_INTERVALS = 200;
/** Grid extent past the total equivalence point, as a multiple of its volume. */
const CURVE_OVERRUN = 1.5;
/** Alkalinity below which SM 2320 B ¶4d advises the two-point method. */
const LOW_ALKALINITY_MGL = 20;

function endpointInsight(
  model: TitrationModel,
  kind: EndpointKind,
  endpointPh: number,
  factor: Caco3Factor,
  parts: Map<EquivalenceName, SteepPart | null>,
  field: string,
): EndpointInsight {
  const equivalence: EquivalenceName = kind === 'phenolphthalein' ? 'carbonate' : 'total';
  const empty = {
    equivalenceVolumeMl: null,
    equivalencePh: null,
    endpointVolumeMl: null,
    errorMl: null,
    errorMgL: null,
    errorMeqL: null,
    errorPercent: null,
    trueResultMgL: null,
    endpointResultMgL: null,
    slopePhPerMl: null,
    slopeFractionOfPeak: null,
    volumePerTenthPhMl: null,
    steep: null,
  };
  const startPh = modelPh(model, 0);
  if (kind === 'phenolphthalein' && startPh <= endpointPh) {
    return {
      kind,
      endpointPh,
      applicable: false,
      note: `The sample starts at pH ${startPh.toFixed(2)}, at or below pH ${endpointPh}: P is zero and there is no carbonate equivalence point to miss.`,
      equivalence,
      ...empty,
      indicators: indicatorsAt(endpointPh),
    };
  }
  const e = endpointError(model, endpointPh, { factor, equivalence, field });
  const part = parts.get(equivalence) ?? null;
  const s = part && endpointSteepness(model, endpointPh, part);
  const perMl = (model.titrantNormality * 1000) / model.sampleVolumeMl;
  return {
    kind,
    endpointPh,
    applicable: true,
    note: null,
    equivalence,
    equivalenceVolumeMl: sig6(e.equivalence.volumeMl),
    equivalencePh: sig6(e.equivalence.pH),
    endpointVolumeMl: sig6(e.endpointVolumeMl),
    errorMl: sig6(e.errorMl),
    errorMgL: sig6(e.errorMgL),
    errorMeqL: sig6(e.errorMl * perMl),
    errorPercent: sig6(e.errorPercent),
    trueResultMgL: sig6(e.trueResultMgL),
    endpointResultMgL: sig6(e.endpointResultMgL),
    slopePhPerMl: s && sig6(s.slope),
    slopeFractionOfPeak: s && sig6(s.fractionOfPeak),
    volumePerTenthPhMl: s && (Number.isFinite(s.volumePerTenthPhMl) ? sig6(s.volumePerTenthPhMl) : null),
    steep: s && s.steep,
    indicators: indicatorsAt(endpointPh),
  };
}

/** Model curve, true equivalence points, fixed-endpoint errors, steepness and indicators by POST /api/v1/calc/endpoint-error [charge balance; SM 2320 B; domain.md 9]. */
export function calculateEndpointError(request: EndpointErrorRequest): EndpointErrorResult {
  const input = parseOrThrow(endpointErrorRequestSchema, request);
  const warnings: ToolWarning[] = [];
  const factor: Caco3Factor = input.caco3Factor ?? DEFAULT_CACO3_FACTOR;
  if (input.temperatureC === undefined) warnings.push(toolWarning('temperature_assumed', 'No temperature given; the model uses 25 °C.', 'temperatureC'));
  if (input.tdsMgL === undefined) {
    warnings.push(toolWarning('activity_not_corrected', 'No TDS given; activity coefficients are taken as 1 (ideal solution).', 'tdsMgL'));
  }
  const temperatureC = input.temperatureC ?? 25;
  const ionicStrength = input.tdsMgL === undefined ? 0 : ionicStrengthFromTds(input.tdsMgL);
  // The same alkalinity ↔ eq/L conversion as /calc/curve, so the true result equals the input.
  const model = carbonateWaterModel({
    sampleVolumeMl: input.sampleVolumeMl,
    titrant: 'acid',
    titrantNormality: input.titrantNormality,
    temperatureC,
    ionicStrength,
    initialPh: input.initialPh,
    alkalinityEqL: input.totalAlkalinity / factor,
  });
  const points: EquivalencePoint[] = equivalencePoints(model);
  const total = points.find((p) => p.name === 'total');
  if (!total) throw inputError('totalAlkalinity', 'the sample has no total-alkalinity equivalence point');
  const parts = new Map<EquivalenceName, SteepPart | null>(points.map((p) => [p.name, steepPart(model, p, total.volumeMl)]));

  const pEndpointPh = input.phenolphthaleinEndpointPh ?? ENDPOINT_PH.phenolphthalein;
  const tEndpointPh = input.totalEndpointPh ?? ENDPOINT_PH.routineTotal;
  const endpoints = [
    endpointInsight(model, 'phenolphthalein', pEndpointPh, factor, parts, 'phenolphthaleinEndpointPh'),
    endpointInsight(model, 'total', tEndpointPh, factor, parts, 'totalEndpointPh'),
  ];
  const recommended = recommendedTotalEndpointPh(input.totalAlkalinity);
  const atRecommendedEndpoint =
    recommended === tEndpointPh ? null : endpointInsight(model, 'total', recommended, factor, parts, 'totalEndpointPh');

  for (const e of endpoints) {
    if (e.applicable && e.steep === false) {
      warnings.push(
        toolWarning(
          'endpoint_outside_steep_part',
          `The pH ${e.endpointPh} endpoint lies outside the steep part of the curve (slope ${((e.slopeFractionOfPeak ?? 0) * 100).toFixed(0)} % of its peak): a 0.1 pH misreading moves it by ${e.volumePerTenthPhMl?.toFixed(3)} mL.`,
          e.kind === 'phenolphthalein' ? 'phenolphthaleinEndpointPh' : 'totalEndpointPh',
        ),
      );
    }
  }
  // pH 4.5 is always acceptable (40 CFR 136.3 Table IB); otherwise flag an endpoint far from Table 2320:I.
  if (tEndpointPh !== ENDPOINT_PH.routineTotal && Math.abs(tEndpointPh - recommended) > 0.15 + 1e-9) {
    warnings.push(
      toolWarning(
        'endpoint_ph_not_recommended',
        `For about ${input.totalAlkalinity} mg/L, SM 2320 B Table 2320:I suggests a total endpoint near pH ${recommended} (or the routine 4.5), not ${tEndpointPh}.`,
        'totalEndpointPh',
      ),
    );
  }
  if (input.totalAlkalinity < LOW_ALKALINITY_MGL) {
    warnings.push(
      toolWarning('low_alkalinity_method_advised', 'Below about 20 mg/L SM 2320 B ¶4d advises the two-point low-alkalinity method: a fixed endpoint reads high there.', 'totalAlkalinity'),
    );
  }

  const special = [
    ...points.map((p) => p.volumeMl),
    ...[...endpoints, ...(atRecommendedEndpoint ? [atRecommendedEndpoint] : [])].flatMap((e) => (e.endpointVolumeMl === null ? [] : [e.endpointVolumeMl])),
  ];
  const maxVolumeMl = Math.max(total.volumeMl * CURVE_OVERRUN, ...special);
  const curvePoints = modelCurve(model, volumeGrid(maxVolumeMl, CURVE_INTERVALS, special)).map((p) => ({ volumeMl: sig6(p.volumeMl), pH: sig6(p.pH) }));

  return {
    curve: {
      points: curvePoints,
      derivative: derivativeSeries(curvePoints).map((d) => ({ volumeMl: sig6(d.volumeMl), pH: sig6(d.pH), slope: sig6(d.slope) })),
    },
    equivalencePoints: points.map((p) => {
      const part = parts.get(p.name) ?? null;
      return {
        name: p.name,
        volumeMl: sig6(p.volumeMl),
        pH: sig6(p.pH),
        resultMgL: sig6((p.volumeMl * model.titrantNormality * factor) / model.sampleVolumeMl),
        steepPart: part && {
          highPh: sig6(part.highPh),
          lowPh: sig6(part.lowPh),
          highVolumeMl: sig6(part.highVolumeMl),
          lowVolumeMl: sig6(part.lowVolumeMl),
          peakPh: sig6(part.peakPh),
          peakVolumeMl: sig6(part.peakVolumeMl),
          maxSlopePhPerMl: sig6(part.maxSlope),
        },
        indicators: indicatorsAt(p.pH),
      };
    }),
    endpoints,
    recommendedTotalEndpointPh: recommended,
    recommendedSource: 'SM 2320 B ¶1, Table 2320:I (about 30 mg/L → pH 4.9, 150 → 4.6, 500 → 4.3; interpolated in log alkalinity)',
    atRecommendedEndpoint,
    indicators: INDICATORS.map((i) => ({ ...i })),
    steepDefinition: STEEP_DEFINITION,
    steepFraction: STEEP_FRACTION,
    model: {
      description: 'Closed carbonate system titrated with strong acid, with dilution; charge balance with Plummer and Busenberg (1982) constants',
      totalCarbonateMmolL: sig6(model.totalCarbonateM * 1000),
      initialPh: input.initialPh,
      temperatureC,
      ionicStrength: sig6(ionicStrength),
      caco3Factor: factor,
    },
    warnings,
  };
}
