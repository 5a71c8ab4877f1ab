/** A run the analysis cannot give a full result for (e.g. a design layer without samples); names the layers. */
export class AnalysisInputError extends Error {
  readonly code: string;
  /** Design layers at fault (1-based). */
  readonly layers: number[];

  constructor(code: string, layers: number[], message: string) {
    super(message);
    this.name = 'AnalysisInputError';
    this.code = code;
    this.layers = layers;
  }
}
