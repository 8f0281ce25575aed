/** What the user got wrong, so callers can tell bad input from bugs without parsing messages. */
export type EngineInputErrorCode =
  | 'file-missing'
  | 'file-unreadable'
  | 'not-an-image'
  | 'unsupported-format'
  | 'too-large'
  | 'animated'
  | 'size-mismatch'
  | 'region-outside'
  | 'region-empty'
  | 'region-too-small'
  | 'camera-moved'
  | 'no-screen-found'
  | 'no-display-light'
  | 'bad-argument';

/** An error caused by the input (files, regions, options), carrying a one-line human message. */
export class EngineInputError extends Error {
  readonly code: EngineInputErrorCode;

  constructor(code: EngineInputErrorCode, message: string) {
    super(message);
    this.name = 'EngineInputError';
    this.code = code;
  }
}

/** True for errors the user can fix by changing the input. */
export function isEngineInputError(error: unknown): error is EngineInputError {
  return error instanceof EngineInputError;
}
