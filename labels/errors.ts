/** Why a label request was refused. Stable strings: the API and the UI switch on them. */
export type LabelErrorCode =
  | 'unknown-kind'
  | 'unknown-stock'
  | 'no-labels'
  | 'too-many-labels'
  | 'bad-start-position'
  | 'invalid-label'
  | 'code-not-encodable'
  | 'code-too-long-for-stock';

/**
 * A refused label request. Thrown before any PDF is made, so a caller never receives half a
 * PDF. `message` is written for the person who asked for the labels.
 */
export class LabelError extends Error {
  readonly code: LabelErrorCode;
  /** Which label (0-based index in the request) caused the error, where one did. */
  readonly labelIndex: number | undefined;

  constructor(code: LabelErrorCode, message: string, labelIndex?: number) {
    super(message);
    this.name = 'LabelError';
    this.code = code;
    this.labelIndex = labelIndex;
  }
}
