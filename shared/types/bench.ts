import type { HistoryComparison, MeterCalibrationOutcome, QcEvaluation, TitreSuggestion, VolatileAcidsRatio } from '../chemistry/bench';
import type { DerivativePoint } from '../chemistry/endpoints';
import type { CalcWarning } from '../chemistry/warnings';
import type { Analysis, SampleStatus, TitrationMethod, TitrationStatus } from '../schemas/bench';

/** DTOs the Bench API returns (server/services/*View functions build them). */

export interface UserRef {
  id: number;
  name: string;
}

export type QualifierCode =
  | 'hold_time_exceeded'
  | 'receipt_temperature'
  | 'standardization_expired'
  | 'titrant_lot_expired'
  | 'qc_failure'
  | 'meter_not_calibrated';

/** A data qualifier stored on the result; `detail` carries the figures behind it. */
export interface Qualifier {
  code: QualifierCode;
  message: string;
  detail?: Record<string, unknown>;
}

/** Engine warnings plus the bench's own advice (a better sample volume or titrant strength). */
export type BenchWarning =
  | CalcWarning
  | { code: 'titre_suggestion'; message: string; field?: string; suggestion: TitreSuggestion }
  | { code: 'volatile_acids_ratio'; message: string; field?: string; ratio: VolatileAcidsRatio };

export interface TitrationSummary {
  id: number;
  analysis: Analysis;
  method: TitrationMethod;
  status: TitrationStatus;
  revision: number;
  version: number;
  analysedAt: string;
  phenolphthaleinAlkalinity: number | null;
  totalAlkalinity: number | null;
  mineralAcidity: number | null;
  totalAcidity: number | null;
  qualifierCodes: QualifierCode[];
  warningCodes: string[];
}

export interface SampleView {
  id: number;
  organizationId: number;
  facility: { id: number; name: string; timezone: string };
  point: { id: number; code: string; name: string; matrix: string };
  sampleType: 'grab' | 'composite';
  compositeStartAt: string | null;
  compositeEndAt: string | null;
  collectedAt: string;
  collectedBy: string | null;
  receivedAt: string | null;
  receiptTemperatureC: number | null;
  preservation: string | null;
  filtered: boolean;
  notes: string | null;
  status: SampleStatus;
  version: number;
  createdBy: UserRef | null;
  createdAt: string;
  updatedAt: string;
  /** Current (not superseded) titrations. */
  titrations: TitrationSummary[];
}

export interface TitrationResults {
  /** mg/L as CaCO3 (numbers to 6 significant figures; `exact` holds the stored decimals). */
  phenolphthaleinAlkalinity: number | null;
  totalAlkalinity: number | null;
  totalAlkalinityMeqL: number | null;
  species: { hydroxide: number; carbonate: number; bicarbonate: number } | null;
  mineralAcidity: number | null;
  totalAcidity: number | null;
  /** The endpoint volumes the result used, mL: pH 8.3 and total for alkalinity, pH 3.7 (mineral) and total for acidity. */
  endpointVolumes: { phenolphthalein?: number | null; mineral?: number | null; total: number | null };
  /** Digester samples with volatile acids: the VA/alkalinity ratio. */
  volatileAcids: { volatileAcidsMgL: number; ratio: number; status: string } | null;
  exact: Record<string, string | null>;
  /** The shared engine's full output for these inputs (calculateAlkalinity / calculateAcidity). */
  engine: unknown;
}

export interface TitrationView {
  id: number;
  sampleId: number;
  organizationId: number;
  pointId: number;
  analysis: Analysis;
  method: TitrationMethod;
  endpointMethod: 'fixed' | 'inflection' | 'gran' | null;
  status: TitrationStatus;
  version: number;
  revision: number;
  amendsId: number | null;
  supersededById: number | null;
  amendReason: string | null;
  returnComment: string | null;
  // inputs, named as in the request body
  sampleVolumeMl: number;
  titrantId: number;
  totalEndpointPh: number | null;
  volumeToPh83Ml: number | null;
  volumeToTotalEndpointMl: number | null;
  volumeToPh37Ml: number | null;
  lowAlkalinity: { firstEndpointPh: number; volumeToFirstEndpointMl: number; volumeToSecondEndpointMl: number; secondEndpointPh?: number | null } | null;
  peroxideTreatment: { acidVolumeMl: number; acidNormality: number } | null;
  temperatureC: number | null;
  initialPh: number | null;
  tdsMgL: number | null;
  specificConductanceUsCm: number | null;
  buretteResolutionMl: number | null;
  volatileAcidsMgL: number | null;
  meterId: string | null;
  analysedAt: string;
  notes: string | null;
  readingCount: number;
  // what the record used
  titrant: { id: number; kind: 'acid' | 'base'; reagent: string; lot: string; nominalNormality: number } | null;
  standardizationId: number | null;
  normalityUsed: number;
  normalitySource: 'standardization' | 'nominal';
  caco3FactorUsed: number;
  qcBatchId: number | null;
  results: TitrationResults | null;
  /** Inputs still needed before the result can be computed (a draft may be incomplete). */
  missingInputs: string[];
  warnings: BenchWarning[];
  qualifiers: Qualifier[];
  analyst: UserRef | null;
  submittedAt: string | null;
  submittedBy: UserRef | null;
  approvedAt: string | null;
  approvedBy: UserRef | null;
  returnedAt: string | null;
  returnedBy: UserRef | null;
  createdBy: UserRef | null;
  createdAt: string;
  updatedAt: string;
}

export interface TitrationDetail extends TitrationView {
  readings: Array<{ seq: number; volumeMl: number; pH: number; temperatureC: number | null }>;
  /** ΔpH/ΔV at midpoints (shared engine), for the Curve view's second axis. */
  derivative: DerivativePoint[];
  sample: Omit<SampleView, 'titrations'>;
  /** Every version of this result, oldest first. */
  versions: Array<{ id: number; revision: number; status: TitrationStatus; analysedAt: string; approvedAt: string | null; amendReason: string | null }>;
  /** How this result compares with its point's recent approved values. */
  history: ReviewHistory | null;
}

export interface ReviewHistory extends HistoryComparison {
  parameter: 'totalAlkalinity' | 'totalAcidity';
  value: number | null;
  /** The most recent approved values, newest first. */
  previous: Array<{ titrationId: number; analysedAt: string; value: number }>;
}

export interface ReviewItem extends TitrationView {
  sample: Omit<SampleView, 'titrations'>;
  history: ReviewHistory;
  /** Convenience copy of history.unusual. */
  unusual: boolean | null;
}

export interface TitrantView {
  id: number;
  organizationId: number;
  kind: 'acid' | 'base';
  reagent: 'H2SO4' | 'HCl' | 'NaOH';
  nominalNormality: number;
  lot: string;
  preparedOn: string | null;
  expiresOn: string;
  active: boolean;
  notes: string | null;
  version: number;
  /** The latest accepted standardisation, if any, and whether it is still valid now. */
  currentStandardization: { id: number; normality: number; standardizedAt: string; validUntil: string; valid: boolean } | null;
  createdAt: string;
}

export interface StandardizationView {
  id: number;
  titrantId: number;
  primaryStandard: 'Na2CO3' | 'KHP';
  mode: 'solution' | 'mass';
  standardGramsPerL: number | null;
  replicates: Array<{ standardVolumeMl?: number; standardGrams?: number; titrantVolumeMl: number; normality: number }>;
  normality: number;
  normalityExact: string;
  rsdPercent: number;
  rsdLimitPercent: number;
  accepted: boolean;
  standardizedAt: string;
  validUntil: string;
  standardizedBy: UserRef | null;
  notes: string | null;
  createdAt: string;
}

export interface CalibrationView {
  id: number;
  organizationId: number;
  meterId: string;
  meterName: string | null;
  calibratedAt: string;
  temperatureC: number;
  buffers: Array<{ nominalPh: number; mV: number }>;
  slopeMvPerPh: number;
  theoreticalSlopeMvPerPh: number;
  percentSlope: number;
  offsetMv: number;
  window: { minPercent: number; maxPercent: number };
  checks: MeterCalibrationOutcome['checks'];
  passed: boolean;
  warnings: MeterCalibrationOutcome['warnings'];
  calibratedBy: UserRef | null;
  notes: string | null;
  createdAt: string;
}

export interface QcBatchView {
  id: number;
  organizationId: number;
  batchDate: string;
  analysis: Analysis;
  analyst: UserRef | null;
  evaluation: QcEvaluation;
  passed: boolean;
  notes: string | null;
  version: number;
  /** The titrations it covers that the caller may see. */
  titrations: Array<{ id: number; sampleId: number; status: TitrationStatus; analysedAt: string }>;
  createdAt: string;
  updatedAt: string;
}
