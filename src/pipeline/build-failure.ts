/** A build that stopped for a reason the user can act on (bad input, a stop request, a failed site build). */
export class BuildFailure extends Error {}
