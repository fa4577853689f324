import { acidityFromReadings, alkalinityFromReadings } from '@shared/chemistry/bench';
import { calculateAcidity, calculateAlkalinity } from '@shared/chemistry/service';
import type { CalcWarning } from '@shared/chemistry/warnings';
import type { Analysis, TitrationMethod } from '@shared/schemas/bench';
import type { TitrantView } from '@shared/types/bench';
import { compact, num } from '@/composables/useLiveCalc';
import { parseReadingsText } from '@/composables/readingsText';

/** The titration form's inputs as typed (strings until parsed). */
export interface TitrationFormState {
  analysis: Analysis;
  method: TitrationMethod;
  titrantId: number | null;
  sampleVolumeMl: string;
  volumeToPh83Ml: string;
  volumeToTotalEndpointMl: string;
  volumeToPh37Ml: string;
  totalEndpointPh: string;
  firstEndpointPh: string;
  volumeToFirstEndpointMl: string;
  volumeToSecondEndpointMl: string;
  initialPh: string;
  temperatureC: string;
  readingsText: string;
  notes: string;
}

export interface LiveFigures {
  p: number | null;
  t: number | null;
  meqL: number | null;
  pVolume: number | null;
  tVolume: number | null;
  warnings: CalcWarning[];
}

/** The normality a titration records: the lot's valid standardisation, else its nominal strength (as the server does). */
export function normalityOf(lot: TitrantView | undefined): { value: number; source: 'standardization' | 'nominal' } | null {
  if (!lot) return null;
  const std = lot.currentStandardization;
  return std && std.valid ? { value: std.normality, source: 'standardization' } : { value: lot.nominalNormality, source: 'nominal' };
}

export function usesReadings(method: TitrationMethod) {
  return method === 'potentiometric_curve';
}

/**
 * The request body for the API from the form: only the inputs the analysis and method use;
 * `nullUnused` sends null for the rest so a patch clears what a change of method left behind.
 */
export function titrationBody(f: TitrationFormState, nullUnused = false): Record<string, unknown> {
  const unused = nullUnused ? null : undefined;
  const alk = f.analysis === 'alkalinity';
  const curve = usesReadings(f.method);
  const two = f.method === 'low_alkalinity_two_point';
  const parsed = curve ? parseReadingsText(f.readingsText) : null;
  const body: Record<string, unknown> = {
    analysis: f.analysis,
    method: f.method,
    titrantId: f.titrantId ?? undefined,
    sampleVolumeMl: num(f.sampleVolumeMl),
    temperatureC: num(f.temperatureC) ?? unused,
    initialPh: num(f.initialPh) ?? unused,
    notes: f.notes.trim() || unused,
    totalEndpointPh: two ? unused : (num(f.totalEndpointPh) ?? unused),
    volumeToPh83Ml: curve ? unused : (num(f.volumeToPh83Ml) ?? unused),
    volumeToTotalEndpointMl: alk && !curve && !two ? (num(f.volumeToTotalEndpointMl) ?? unused) : unused,
    volumeToPh37Ml: !alk && !curve ? (num(f.volumeToPh37Ml) ?? unused) : unused,
    lowAlkalinity: two
      ? compact({ firstEndpointPh: num(f.firstEndpointPh), volumeToFirstEndpointMl: num(f.volumeToFirstEndpointMl), volumeToSecondEndpointMl: num(f.volumeToSecondEndpointMl) })
      : unused,
    readings: curve && parsed && parsed.readings.length ? parsed.readings : unused,
  };
  return compact(body);
}

/** P and T (or mineral and total acidity) computed in the browser with the shared engine while typing. */
export function liveFigures(f: TitrationFormState, normality: number | null): LiveFigures {
  if (normality === null) throw new Error('Choose a titrant lot to compute the result.');
  const b = titrationBody(f) as Record<string, never>;
  const common = { sampleVolumeMl: b.sampleVolumeMl, titrantNormality: normality };
  if (usesReadings(f.method)) {
    const parsed = parseReadingsText(f.readingsText);
    if (parsed.errors.length) throw new Error(parsed.errors[0]);
    if (parsed.readings.length < 2) throw new Error('Paste or type at least two readings.');
  }
  const opt = (k: string) => (b[k] === undefined ? {} : { [k]: b[k] });
  if (f.analysis === 'alkalinity') {
    const extra = { ...opt('temperatureC'), ...opt('initialPh') };
    const r = usesReadings(f.method)
      ? alkalinityFromReadings({ ...common, readings: b.readings, ...opt('totalEndpointPh'), ...extra })
      : f.method === 'low_alkalinity_two_point'
        ? calculateAlkalinity({ ...common, lowAlkalinity: b.lowAlkalinity, ...opt('volumeToPh83Ml'), ...extra })
        : calculateAlkalinity({ ...common, volumeToPh83Ml: b.volumeToPh83Ml, volumeToTotalEndpointMl: b.volumeToTotalEndpointMl, ...opt('totalEndpointPh'), ...extra });
    return {
      p: r.phenolphthaleinAlkalinity,
      t: r.totalAlkalinity,
      meqL: r.totalAlkalinityMeqL,
      pVolume: r.endpoints.phenolphthalein.volumeMl,
      tVolume: r.endpoints.total.volumeMl,
      warnings: r.warnings,
    };
  }
  const r = usesReadings(f.method)
    ? acidityFromReadings({ ...common, readings: b.readings, ...opt('totalEndpointPh') })
    : calculateAcidity({ ...common, volumeToPh83Ml: b.volumeToPh83Ml, ...opt('volumeToPh37Ml'), ...opt('totalEndpointPh') });
  return {
    p: r.mineralAcidity,
    t: r.totalAcidity,
    meqL: r.totalAcidityMeqL,
    pVolume: r.endpoints.mineral?.volumeMl ?? null,
    tVolume: r.endpoints.total.volumeMl,
    warnings: r.warnings,
  };
}
