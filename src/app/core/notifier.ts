import { Injectable, inject } from '@angular/core';
import { MatSnackBar } from '@angular/material/snack-bar';

/** The one place that raises snack bars, so errors and confirmations look and last the same everywhere. */
@Injectable({ providedIn: 'root' })
export class Notifier {
  private readonly snackBar = inject(MatSnackBar);

  /** Errors stay until dismissed: a message that vanishes before it is read is a silent failure. */
  error(message: string): void {
    this.snackBar.open(message, 'Dismiss', { panelClass: 'sm-snack-error', politeness: 'assertive' });
  }

  info(message: string): void {
    this.snackBar.open(message, 'OK', { duration: 5000 });
  }
}
