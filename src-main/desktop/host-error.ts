/**
 * A refusal or failure the host explains to the user. Its message is shown as is; any other error
 * is reported without its details, so that no stack or path leaks to the renderer.
 */
export class HostError extends Error {
  constructor(
    readonly code: string,
    message: string,
    readonly issues: string[] = [],
  ) {
    super(message);
    this.name = 'HostError';
  }
}
