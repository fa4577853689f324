/** Codes of the tools' warnings; the client switches on `code`, `message` is for people. */
export type ToolWarningCode =
  | 'temperature_assumed'
  | 'activity_not_corrected'
  | 'ionic_strength_high'
  | 'endpoint_outside_steep_part'
  | 'endpoint_ph_not_recommended'
  | 'low_alkalinity_method_advised'
  | 'negative_removal'
  | 'alternative_compliance_possible'
  | 'step1_not_required'
  | 'denitrified_exceeds_nitrified'
  | 'alkalinity_exhausted'
  | 'ratio_rising';

export interface ToolWarning {
  code: ToolWarningCode;
  message: string;
  /** The input the warning is about, when there is one. */
  field?: string;
}

/** Builds a warning record [the calculation API's warning shape, shared/chemistry/warnings.ts]. */
export function toolWarning(code: ToolWarningCode, message: string, field?: string): ToolWarning {
  return field === undefined ? { code, message } : { code, message, field };
}

/** 6 significant figures for API numbers: far finer than any reporting resolution [as the calculation API]. */
export function sig6(value: number): number {
  return Number(value.toPrecision(6));
}

