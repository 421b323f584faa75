import { HttpErrorResponse } from '@angular/common/http';
import { MIN_PASSWORD_LENGTH } from '../../../../shared/auth/user-schemas';
import { fieldProblems, isOfflineError, serverMessage } from '../../core/api/api-error';

export { MIN_PASSWORD_LENGTH };

/** What the form says under a new password; the server has the last word (common passwords). */
export const PASSWORD_HINT = `At least ${MIN_PASSWORD_LENGTH} characters. A few unrelated words are easy to remember and hard to guess.`;

/** One readable sentence for a failed request: the field the server named, else its message. */
export function describeAccountError(err: unknown, fallback: string): string {
  if (isOfflineError(err)) return 'No connection to the server. This needs a connection; try again when you have one.';
  const fields = fieldProblems(err);
  if (fields.length) return fields.map((f) => f.message).join('. ');
  if (err instanceof HttpErrorResponse && err.status === 429) return serverMessage(err, 'Too many attempts; wait a while.');
  return serverMessage(err, fallback);
}
