/**
 * The one error type the CAD side throws at a user: a stable code and a message that says what
 * to change, naming the feature id where there is one. Never a bare kernel number.
 */
export class PlateBuildError extends Error {
  readonly code: string;
  readonly featureIds: readonly string[];

  constructor(code: string, message: string, featureIds: readonly string[] = []) {
    super(message);
    this.name = 'PlateBuildError';
    this.code = code;
    this.featureIds = featureIds;
  }
}

export function isPlateBuildError(e: unknown): e is PlateBuildError {
  return e instanceof PlateBuildError;
}

/**
 * Turns whatever the kernel threw (a WebAssembly.Exception, a raw pointer number, an Error) into
 * readable text: the kernel's own exception type and message where it can be decoded.
 */
export function describeKernelFailure(oc: unknown, e: unknown): string {
  const k = oc as {
    getExceptionMessage?: (ex: unknown) => [string, string];
    OCJS?: { getStandard_FailureData?: (p: number) => { GetMessageString?: () => string } };
  };
  try {
    if (typeof WebAssembly !== 'undefined' && 'Exception' in WebAssembly && e instanceof (WebAssembly as unknown as { Exception: new (...a: never[]) => object }).Exception) {
      const [type, message] = k.getExceptionMessage?.(e) ?? ['kernel exception', ''];
      return message ? `${type}: ${message}` : type;
    }
    if (typeof e === 'number') {
      const data = k.OCJS?.getStandard_FailureData?.(e);
      const msg = data?.GetMessageString?.();
      return msg ? `kernel failure: ${msg}` : `kernel failure (code ${e})`;
    }
  } catch {
    /* decoding is best effort */
  }
  if (e instanceof Error) return e.message;
  return String(e);
}
