import { acidityFromReadings, alkalinityFromReadings, titreSuggestion, volatileAcidsRatio } from '../../shared/chemistry/bench.js';
import type { Caco3Factor } from '../../shared/chemistry/constants.js';
import { Dec } from '../../shared/chemistry/decimal.js';
import { calculateAcidity, calculateAlkalinity, type AcidityResult, type AlkalinityResult } from '../../shared/chemistry/service.js';
import { InputError } from '../../shared/errors.js';
import { POTENTIOMETRIC_METHODS, type Analysis, type TitrationMethod } from '../../shared/schemas/bench.js';
import type { BenchWarning } from '../../shared/types/bench.js';

/**
 * The bridge between a stored titration and the shared engine: which inputs a method uses,
 * which it still lacks, and the engine call that turns them into the recorded result. Nothing
 * here computes a figure itself.
 */

export interface ComputeInputs {
  analysis: Analysis;
  method: TitrationMethod;
  endpointMethod?: 'fixed' | 'inflection' | 'gran' | null;
  sampleVolumeMl: number;
  totalEndpointPh?: number | null;
  volumeToPh83Ml?: number | null;
  volumeToTotalEndpointMl?: number | null;
  volumeToPh37Ml?: number | null;
  lowAlkalinity?: { firstEndpointPh: number; volumeToFirstEndpointMl: number; volumeToSecondEndpointMl: number; secondEndpointPh?: number | null } | null;
  peroxideTreatment?: { acidVolumeMl: number; acidNormality: number } | null;
  readings?: Array<{ volumeMl: number; pH: number; temperatureC?: number | null }> | null;
  temperatureC?: number | null;
  initialPh?: number | null;
  tdsMgL?: number | null;
  specificConductanceUsCm?: number | null;
  buretteResolutionMl?: number | null;
  volatileAcidsMgL?: number | null;
  meterId?: string | null;
}

type Field = keyof ComputeInputs | 'meterId';

const COMMON: Field[] = ['analysis', 'method', 'sampleVolumeMl', 'temperatureC', 'initialPh', 'buretteResolutionMl'];
const ALKALINITY_ONLY: Field[] = ['tdsMgL', 'specificConductanceUsCm', 'volatileAcidsMgL'];

/** The inputs each analysis and method uses (anything else in a request is named as not used). */
export function fieldsUsed(analysis: Analysis, method: TitrationMethod): Set<Field> {
  const own: Field[] = [];
  if (analysis === 'alkalinity') {
    own.push(...ALKALINITY_ONLY);
    if (method === 'color_indicator' || method === 'potentiometric_fixed') own.push('volumeToPh83Ml', 'volumeToTotalEndpointMl', 'totalEndpointPh');
    if (method === 'potentiometric_curve') own.push('readings', 'endpointMethod', 'totalEndpointPh');
    if (method === 'low_alkalinity_two_point') own.push('lowAlkalinity', 'volumeToPh83Ml');
  } else {
    if (method === 'color_indicator' || method === 'potentiometric_fixed') own.push('volumeToPh37Ml', 'volumeToPh83Ml', 'totalEndpointPh', 'peroxideTreatment');
    if (method === 'potentiometric_curve') own.push('readings', 'totalEndpointPh', 'peroxideTreatment');
  }
  if (POTENTIOMETRIC_METHODS.includes(method)) own.push('meterId');
  return new Set([...COMMON, ...own]);
}

/** Field errors for inputs given to a method that does not use them, and for impossible combinations. */
export function inapplicableFieldErrors(analysis: Analysis, method: TitrationMethod, given: Record<string, unknown>): Record<string, string> {
  const errors: Record<string, string> = {};
  if (analysis === 'acidity' && method === 'low_alkalinity_two_point') {
    errors.method = 'the two-point method is for low alkalinity (SM 2320 B ¶4d), not acidity';
    return errors;
  }
  const used = fieldsUsed(analysis, method);
  const candidates: Field[] = [
    'endpointMethod', 'totalEndpointPh', 'volumeToPh83Ml', 'volumeToTotalEndpointMl', 'volumeToPh37Ml', 'lowAlkalinity',
    'peroxideTreatment', 'readings', 'tdsMgL', 'specificConductanceUsCm', 'volatileAcidsMgL', 'meterId',
  ];
  for (const f of candidates) {
    const v = given[f];
    if (v === undefined || v === null) continue;
    if (!used.has(f)) errors[f] = `not used by ${analysis} with method ${method}`;
  }
  return errors;
}

/** Inputs the method needs before it can be computed (a draft may lack them). */
export function missingInputs(i: ComputeInputs, readingCount: number): string[] {
  const missing: string[] = [];
  const need = (f: keyof ComputeInputs) => {
    if (i[f] === undefined || i[f] === null) missing.push(f);
  };
  if (i.method === 'potentiometric_curve') {
    if (readingCount < 2) missing.push('readings');
  } else if (i.method === 'low_alkalinity_two_point') need('lowAlkalinity');
  else if (i.analysis === 'alkalinity') {
    need('volumeToPh83Ml');
    need('volumeToTotalEndpointMl');
  } else need('volumeToPh83Ml');
  return missing;
}

const opt = <K extends string, V>(key: K, value: V | null | undefined): Partial<Record<K, V>> =>
  value === null || value === undefined ? {} : ({ [key]: value } as Record<K, V>);

export interface StoredColumns {
  phenolphthaleinAlkalinity: string | null;
  totalAlkalinity: string | null;
  totalAlkalinityMeqL: string | null;
  hydroxide: string | null;
  carbonate: string | null;
  bicarbonate: string | null;
  mineralAcidity: string | null;
  totalAcidity: string | null;
  endpointPVolumeMl: string | null;
  endpointTVolumeMl: string | null;
}

export const EMPTY_COLUMNS: StoredColumns = {
  phenolphthaleinAlkalinity: null,
  totalAlkalinity: null,
  totalAlkalinityMeqL: null,
  hydroxide: null,
  carbonate: null,
  bicarbonate: null,
  mineralAcidity: null,
  totalAcidity: null,
  endpointPVolumeMl: null,
  endpointTVolumeMl: null,
};

/** The stored decimals of a result: the engine's exact figure to the column's 8 places. */
const col = (exact: string | null | undefined) => (exact === null || exact === undefined ? null : new Dec(exact).toDecimalPlaces(8).toFixed(8));

export interface Computed {
  columns: StoredColumns;
  /** What the record keeps as `result`: the engine's output and the bench's additions. */
  result: { engine: unknown; volatileAcids?: { volatileAcidsMgL: number; ratio: number; status: string } | null };
  warnings: BenchWarning[];
}

/** Engine output without the per-reading derivative (recomputed from the readings on read). */
function withoutDerivative(r: AlkalinityResult): unknown {
  if (!r.curve) return r;
  const { derivative: _d, ...curve } = r.curve;
  return { ...r, curve };
}

/**
 * Runs the shared engine for a complete titration: calculateAlkalinity / calculateAcidity, or
 * their curve forms for recorded readings. Throws the engine's InputError (field names match
 * the request body) for inputs that are present but not valid.
 */
export function computeTitration(i: ComputeInputs, titrantNormality: number, nominalNormality: number, caco3Factor: Caco3Factor): Computed {
  const common = {
    sampleVolumeMl: i.sampleVolumeMl,
    titrantNormality,
    caco3Factor,
    ...opt('buretteResolutionMl', i.buretteResolutionMl),
  };
  const warnings: BenchWarning[] = [];
  let titre: number;
  let resolution = i.buretteResolutionMl ?? undefined;

  if (i.analysis === 'alkalinity') {
    const alkCommon = { ...common, ...opt('temperatureC', i.temperatureC), ...opt('initialPh', i.initialPh), ...opt('tdsMgL', i.tdsMgL), ...opt('specificConductanceUsCm', i.specificConductanceUsCm) };
    let r: AlkalinityResult;
    if (i.method === 'potentiometric_curve') {
      r = alkalinityFromReadings({
        ...alkCommon,
        readings: (i.readings ?? []).map((x) => ({ volumeMl: x.volumeMl, pH: x.pH })),
        ...opt('endpointMethod', i.endpointMethod),
        ...opt('totalEndpointPh', i.totalEndpointPh),
      });
      titre = Number(r.exact.totalVolumeMl);
    } else if (i.method === 'low_alkalinity_two_point') {
      const low = i.lowAlkalinity!;
      r = calculateAlkalinity({
        ...alkCommon,
        ...opt('volumeToPh83Ml', i.volumeToPh83Ml),
        lowAlkalinity: {
          firstEndpointPh: low.firstEndpointPh,
          volumeToFirstEndpointMl: low.volumeToFirstEndpointMl,
          volumeToSecondEndpointMl: low.volumeToSecondEndpointMl,
          ...opt('secondEndpointPh', low.secondEndpointPh),
        },
      });
      titre = low.volumeToSecondEndpointMl;
      // The engine reads the two-point method with a 10-mL microburet [SM 2320 B ¶4d].
      resolution = resolution ?? 0.01;
    } else {
      r = calculateAlkalinity({ ...alkCommon, volumeToPh83Ml: i.volumeToPh83Ml!, volumeToTotalEndpointMl: i.volumeToTotalEndpointMl!, ...opt('totalEndpointPh', i.totalEndpointPh) });
      titre = i.volumeToTotalEndpointMl!;
    }
    warnings.push(...r.warnings);
    let volatileAcids: Computed['result']['volatileAcids'] = null;
    if (i.volatileAcidsMgL !== null && i.volatileAcidsMgL !== undefined) {
      const ratio = volatileAcidsRatio(i.volatileAcidsMgL, r.exact.totalAlkalinity);
      if (ratio) {
        volatileAcids = { volatileAcidsMgL: i.volatileAcidsMgL, ...ratio };
        if (ratio.status !== 'stable') {
          warnings.push({
            code: 'volatile_acids_ratio',
            field: 'volatileAcidsMgL',
            ratio,
            message: `VA/alkalinity is ${ratio.ratio}: ${ratio.status === 'act' ? 'above about 0.3, reduce the feed or add alkalinity' : 'above the stable 0.1–0.25; watch the trend'} (common practice).`,
          });
        }
      }
    }
    addSuggestion(warnings, { titre, i, titrantNormality, nominalNormality, resolution });
    return {
      columns: {
        ...EMPTY_COLUMNS,
        phenolphthaleinAlkalinity: col(r.exact.phenolphthaleinAlkalinity),
        totalAlkalinity: col(r.exact.totalAlkalinity),
        totalAlkalinityMeqL: col(r.exact.totalAlkalinityMeqL),
        hydroxide: col(r.exact.species.hydroxide),
        carbonate: col(r.exact.species.carbonate),
        bicarbonate: col(r.exact.species.bicarbonate),
        endpointPVolumeMl: col(r.exact.phenolphthaleinVolumeMl),
        endpointTVolumeMl: col(r.exact.totalVolumeMl),
      },
      result: { engine: withoutDerivative(r), volatileAcids },
      warnings,
    };
  }

  let r: AcidityResult;
  let mineralVolume: string | null;
  let totalVolume: string;
  if (i.method === 'potentiometric_curve') {
    const curve = acidityFromReadings({
      ...common,
      readings: (i.readings ?? []).map((x) => ({ volumeMl: x.volumeMl, pH: x.pH })),
      ...opt('totalEndpointPh', i.totalEndpointPh),
      ...opt('peroxideTreatment', i.peroxideTreatment),
    });
    r = curve;
    mineralVolume = curve.curveVolumes.mineralMl;
    totalVolume = curve.curveVolumes.totalMl;
  } else {
    r = calculateAcidity({
      ...common,
      volumeToPh83Ml: i.volumeToPh83Ml!,
      ...opt('volumeToPh37Ml', i.volumeToPh37Ml),
      ...opt('totalEndpointPh', i.totalEndpointPh),
      ...opt('peroxideTreatment', i.peroxideTreatment),
    });
    mineralVolume = i.volumeToPh37Ml === null || i.volumeToPh37Ml === undefined ? null : String(i.volumeToPh37Ml);
    totalVolume = String(i.volumeToPh83Ml);
  }
  titre = Number(totalVolume);
  warnings.push(...r.warnings);
  addSuggestion(warnings, { titre, i, titrantNormality, nominalNormality, resolution });
  return {
    columns: {
      ...EMPTY_COLUMNS,
      mineralAcidity: col(r.exact.mineralAcidity),
      totalAcidity: col(r.exact.totalAcidity),
      endpointPVolumeMl: col(mineralVolume),
      endpointTVolumeMl: col(totalVolume),
    },
    result: { engine: r },
    warnings,
  };
}

function addSuggestion(
  warnings: BenchWarning[],
  o: { titre: number; i: ComputeInputs; titrantNormality: number; nominalNormality: number; resolution: number | undefined },
) {
  const suggestion = titreSuggestion({
    titrantVolumeMl: o.titre,
    sampleVolumeMl: o.i.sampleVolumeMl,
    titrantNormality: o.titrantNormality,
    nominalNormality: o.nominalNormality,
    ...(o.resolution ? { buretteResolutionMl: o.resolution } : {}),
  });
  if (suggestion) warnings.push({ code: 'titre_suggestion', message: suggestion.message, field: 'sampleVolumeMl', suggestion });
}

/** True for an engine refusal of the inputs (a 400), as opposed to a fault. */
export const isInputError = (e: unknown): e is InputError => e instanceof InputError;
