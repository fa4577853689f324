/**
 * Interpretation bands: a quantity's value falls in exactly one band, which carries a level
 * (shown as icon + word, never colour alone) and the source of the band's limits.
 */

/** ok: in the desirable range; caution: watch or adjust; act: corrective action; info: a tendency, neither good nor bad. */
export type BandLevel = 'ok' | 'caution' | 'act' | 'info';

export interface Band<K extends string = string> {
  key: K;
  /** One or two words for the tag. */
  label: string;
  /** What the band means, in the trade's words. */
  meaning: string;
  level: BandLevel;
  /** Upper limit of the band; null for the last, open-ended band. */
  upper: number | null;
  /** Whether a value equal to `upper` belongs to this band (else to the next). */
  includesUpper: boolean;
}

export interface BandScale<K extends string = string> {
  quantity: string;
  unit: string;
  source: string;
  /** Ascending by `upper`; the last band is open-ended. */
  bands: ReadonlyArray<Band<K>>;
}

/** The band a value falls in: the first whose upper limit admits it [definition of a band table]. */
export function classify<K extends string>(scale: BandScale<K>, value: number): Band<K> {
  for (const band of scale.bands) {
    if (band.upper === null) return band;
    if (value < band.upper || (band.includesUpper && value === band.upper)) return band;
  }
  // Unreachable for a well-formed scale (the last band is open); keep the type total.
  return scale.bands[scale.bands.length - 1];
}

/** Rounds (half toward +∞, as Math.round) to the decimals a figure is reported with, so the band shown matches the figure shown [common practice: classify the reported value]. */
export function roundTo(value: number, decimals: number): number {
  const f = 10 ** decimals;
  // Adding 0 turns −0 into 0, which would otherwise print as "-0.00".
  return Math.round(value * f) / f + 0;
}

/** Langelier index bands by sign: > 0 deposits CaCO3, < 0 dissolves it, 0 saturated [Langelier 1936; Roberge 2008]. */
export const LSI_BANDS: BandScale<'dissolves_caco3' | 'saturated' | 'deposits_caco3'> = {
  quantity: 'Langelier saturation index',
  unit: '',
  source: 'Langelier 1936 (sign convention: LSI = pH − pHs); Roberge 2008; SM 2330 A (indices are guides, not absolutes)',
  bands: [
    { key: 'dissolves_caco3', label: 'Aggressive', meaning: 'Undersaturated: tends to dissolve CaCO3; no protective deposit forms', level: 'caution', upper: 0, includesUpper: false },
    { key: 'saturated', label: 'Saturated', meaning: 'At saturation: neither deposits nor dissolves CaCO3', level: 'ok', upper: 0, includesUpper: true },
    { key: 'deposits_caco3', label: 'Scale-forming', meaning: 'Supersaturated: tends to deposit CaCO3', level: 'info', upper: null, includesUpper: false },
  ],
};

/**
 * Ryznar index bands: < 6 scaling (more as it falls), 6–7 little scale, > 7 no protective
 * CaCO3 film, > 8 mild-steel corrosion increasingly likely [Ryznar 1944; NACE; domain.md 8.3].
 * Limits 6 and 7 belong to the middle band and 8 to the third, as in corrosion.ts.
 */
export const RSI_BANDS: BandScale<'scaling' | 'little_scale' | 'no_protective_film' | 'corrosive'> = {
  quantity: 'Ryznar stability index',
  unit: '',
  source: 'Ryznar 1944, J. AWWA 36:472 (RSI = 2 pHs − pH); NACE corrosion library',
  bands: [
    { key: 'scaling', label: 'Scaling', meaning: 'Below about 6: scale-forming, more so as the index falls', level: 'caution', upper: 6, includesUpper: false },
    { key: 'little_scale', label: 'Balanced', meaning: '6 to 7: little scale and little corrosion', level: 'ok', upper: 7, includesUpper: true },
    { key: 'no_protective_film', label: 'No film', meaning: 'Above 7: CaCO3 unlikely to form a protective film', level: 'caution', upper: 8, includesUpper: true },
    { key: 'corrosive', label: 'Corrosive', meaning: 'Above 8: mild-steel corrosion increasingly likely', level: 'act', upper: null, includesUpper: false },
  ],
};

/** CCPP by sign: positive precipitates, negative dissolves (SM 2330 convention, opposite to the marble test) [SM 2330; AWWA M12 via 35 IAC 604.900]. */
export const CCPP_BANDS: BandScale<'dissolves' | 'saturated' | 'precipitates'> = {
  quantity: 'Calcium carbonate precipitation potential',
  unit: 'mg/L as CaCO3',
  source: 'SM 2330 sign convention (positive: would precipitate); the marble test reports the opposite sign (35 IAC 604.900, citing AWWA M12)',
  bands: [
    { key: 'dissolves', label: 'Would dissolve', meaning: 'Undersaturated: this much CaCO3 would dissolve before saturation', level: 'caution', upper: 0, includesUpper: false },
    { key: 'saturated', label: 'Saturated', meaning: 'At saturation', level: 'ok', upper: 0, includesUpper: true },
    { key: 'precipitates', label: 'Would precipitate', meaning: 'Supersaturated: this much CaCO3 would precipitate to reach saturation', level: 'info', upper: null, includesUpper: false },
  ],
};

/**
 * Digester VA/alkalinity ratio: about 0.1–0.25 stable; a rising trend or above about 0.3–0.4
 * calls for corrective action [Gerardi 2003 for the concept; thresholds common practice, they
 * vary by source]. Titrata acts at the lower end, 0.3, and watches between 0.25 and 0.3.
 */
export const DIGESTER_BANDS: BandScale<'stable' | 'watch' | 'act'> = {
  quantity: 'Volatile acids / alkalinity ratio',
  unit: '',
  source: 'Gerardi 2003, The Microbiology of Anaerobic Digesters (concept); thresholds common practice (about 0.1–0.25 stable; act above about 0.3–0.4)',
  bands: [
    { key: 'stable', label: 'Stable', meaning: 'Up to about 0.25: stable digestion (0.1–0.25 typical)', level: 'ok', upper: 0.25, includesUpper: true },
    { key: 'watch', label: 'Watch', meaning: 'Above 0.25: watch the trend; test more often', level: 'caution', upper: 0.3, includesUpper: true },
    { key: 'act', label: 'Act', meaning: 'Above about 0.3 (sources say 0.3–0.4): reduce feed and/or add alkalinity', level: 'act', upper: null, includesUpper: false },
  ],
};
