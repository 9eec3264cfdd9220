// Errors the engine throws. Callers (the server's worker, the command line) map them by class.

/** The input violates a precondition: a node out of range, a non-integer capacity, s = t. */
export class FlowInputError extends Error {
  override readonly name: string = 'FlowInputError';
}

/** The capacity leaving the source is too large to sum exactly in a double (see MAX_EXACT_SUM). */
export class FlowOverflowError extends Error {
  override readonly name = 'FlowOverflowError';
}

/** The caller's shouldAbort() returned true; the flow state is feasible but not maximum. */
export class FlowAbortedError extends Error {
  override readonly name = 'FlowAbortedError';
}
