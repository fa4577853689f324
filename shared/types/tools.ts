/** What GET /tools/inputs returns: a point's latest approved bench figures, each with where it came from. */
export interface ToolInputValue {
  value: number;
  titrationId: number;
  sampleId: number;
  analysedAt: string;
}

export const TOOL_INPUT_FIELDS = [
  'totalAlkalinity',
  'phenolphthaleinAlkalinity',
  'pH',
  'temperatureC',
  'tdsMgL',
  'specificConductanceUsCm',
  'volatileAcidsMgL',
  'totalAcidity',
  'sampleVolumeMl',
  'titrantNormality',
  'volumeToPh83Ml',
  'volumeToTotalEndpointMl',
] as const;
export type ToolInputField = (typeof TOOL_INPUT_FIELDS)[number];

export interface ToolInputs {
  point: { id: number; code: string; name: string; matrix: string; facility: { id: number; name: string } };
  /** Each figure from the most recent approved (current, not superseded) result at the point that records it. */
  values: Partial<Record<ToolInputField, ToolInputValue>>;
  /** Digester points: the VA/alkalinity ratios of earlier approved results, oldest first (up to 5), before the latest. */
  previousVolatileAcidsRatios: number[];
  /** How many approved results were looked through. */
  searched: number;
}
