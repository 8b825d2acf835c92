/** A usage or input problem: exit status 2 with a message that names file, row and column. */
export class InputError extends Error {}
