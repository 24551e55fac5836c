import { ErrorHandler, Injectable, inject } from '@angular/core';
import { ApiError } from './api-error';
import { Notifier } from './notifier';

/**
 * The one ErrorHandler: logs everything that escapes a component or a subscription. Failed API calls
 * were already shown by the error interceptor, so only unexpected (programming) errors raise a snack bar.
 */
@Injectable()
export class AppErrorHandler implements ErrorHandler {
  private readonly notifier = inject(Notifier);

  handleError(error: unknown): void {
    console.error('[Specimetry]', error);
    if (error instanceof ApiError) return;
    const text = error instanceof Error ? error.message : String(error);
    this.notifier.error(`Something went wrong on this page: ${text}. Reload the page; if it happens again, tell your administrator.`);
  }
}
