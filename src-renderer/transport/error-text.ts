import { ApiError } from './client.js';

/**
 * What went wrong, in the words to show: the host's message with its issues (each said once: a host
 * often words its one issue as the message itself), a cancelled job as nothing changed.
 */
export function errorText(error: unknown): string {
  if (error instanceof ApiError) {
    if (error.code === 'cancelled') return 'Cancelled; nothing was changed.';
    const more = error.issues.filter((issue) => !error.message.includes(issue));
    return more.length > 0 ? `${error.message}: ${more.join('; ')}` : error.message;
  }
  return error instanceof Error ? error.message : String(error);
}
