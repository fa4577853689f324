/** Codes of suspicious-but-legal input; the client switches on `code`, `message` is for people. */
export type CalcWarningCode =
  | 'endpoint_ph_not_recommended'
  | 'titrant_volume_small'
  | 'titrant_volume_large'
  | 'low_alkalinity_method_advised'
  | 'first_endpoint_ph_outside_range'
  | 'phenolphthalein_alkalinity_with_low_ph'
  | 'inflection_not_appropriate'
  | 'gran_poor_fit'
  | 'net_alkaline'
  | 'temperature_assumed'
  | 'activity_not_corrected'
  | 'ionic_strength_high'
  | 'non_carbonate_bases_possible';

export interface CalcWarning {
  code: CalcWarningCode;
  message: string;
  /** The input the warning is about, as a dotted path, when there is one. */
  field?: string;
}

/** Builds a warning record. */
export function calcWarning(code: CalcWarningCode, message: string, field?: string): CalcWarning {
  return field === undefined ? { code, message } : { code, message, field };
}

/**
 * Reading resolution of a 50-mL Class A burette, mL [common practice: it is read to 0.01–0.02 mL].
 * A titre shorter than 50 reading increments (1.0 mL here) carries more than 2 %
 * reading error, so it is flagged.
 */
export const DEFAULT_BURETTE_RESOLUTION_ML = 0.02;
/** Reading increments a titre should span: 50, so one increment is at most 2 % of it [common practice]. */
export const MIN_TITRE_INCREMENTS = 50;
/** Titrant volume above which EPA Method 310.1 advises a smaller aliquot [NEMI summary of EPA 310.1]. */
export const MAX_TITRANT_VOLUME_ML = 50;

/** Flags a titre too small for the burette's resolution or above 50 mL [common practice; EPA 310.1]. */
export function titrantVolumeWarnings(
  volumeMl: number,
  field: string,
  buretteResolutionMl: number = DEFAULT_BURETTE_RESOLUTION_ML,
): CalcWarning[] {
  const out: CalcWarning[] = [];
  const minimum = buretteResolutionMl * MIN_TITRE_INCREMENTS;
  if (volumeMl > 0 && volumeMl < minimum) {
    out.push(
      calcWarning(
        'titrant_volume_small',
        `Titrant volume ${volumeMl} mL is under ${minimum} mL: one burette reading step (${buretteResolutionMl} mL) is more than 2 % of it. Use a larger sample or a weaker titrant.`,
        field,
      ),
    );
  }
  if (volumeMl > MAX_TITRANT_VOLUME_ML) {
    out.push(
      calcWarning(
        'titrant_volume_large',
        `Titrant volume ${volumeMl} mL is over ${MAX_TITRANT_VOLUME_ML} mL; EPA Method 310.1 advises a smaller sample or a stronger titrant.`,
        field,
      ),
    );
  }
  return out;
}
