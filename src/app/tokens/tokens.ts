import { DatePipe } from '@angular/common';
import { HttpClient, HttpContext, httpResource } from '@angular/common/http';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { FormBuilder, FormGroupDirective, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatTableModule } from '@angular/material/table';
import { RouterLink } from '@angular/router';
import { TOKEN_MAX_DAYS, type ApiTokenView, type TokenCreated, type TokenScope } from '../../../shared/tokens';
import { ApiError, ERRORS_SHOWN_INLINE } from '../core/api-error';
import { serverError, showServerErrors } from '../core/form-errors';
import { Notifier } from '../core/notifier';

const STATUS_LABELS: Record<ApiTokenView['status'], string> = { active: 'Active', expired: 'Expired', revoked: 'Revoked' };

/**
 * Personal access tokens for scripts (FE batch post-processing pushing results). The secret is
 * shown once, right after creation; the server keeps only its hash.
 */
@Component({
  selector: 'sm-tokens',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DatePipe, ReactiveFormsModule, RouterLink, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, MatProgressBarModule, MatSelectModule, MatTableModule],
  templateUrl: './tokens.html',
  styleUrl: './tokens.scss',
})
export class Tokens {
  private readonly http = inject(HttpClient);
  private readonly notifier = inject(Notifier);

  protected readonly tokens = httpResource<{ tokens: ApiTokenView[] }>(() => '/api/tokens');
  protected readonly rows = computed(() => (this.tokens.hasValue() ? this.tokens.value().tokens : []).map((t) => ({ ...t, statusLabel: STATUS_LABELS[t.status] })));
  protected readonly columns = ['name', 'prefix', 'scope', 'status', 'expiresAt', 'lastUsedAt', 'actions'];
  protected readonly maxDays = TOKEN_MAX_DAYS;
  protected readonly lifetimes = [7, 30, 90, 180, 365].filter((d) => d <= TOKEN_MAX_DAYS);
  protected readonly serverError = serverError;
  protected readonly busy = signal(false);
  protected readonly failure = signal<string | null>(null);
  protected readonly created = signal<TokenCreated | null>(null);
  protected readonly origin = typeof location === 'undefined' ? 'http://localhost:3000' : location.origin;

  protected readonly form = inject(FormBuilder).nonNullable.group({
    name: ['', [Validators.required, Validators.maxLength(80)]],
    scope: ['read' as TokenScope, Validators.required],
    expiresInDays: [90, [Validators.required, Validators.min(1), Validators.max(TOKEN_MAX_DAYS)]],
  });

  protected createToken(formDirective: FormGroupDirective): void {
    if (this.form.invalid) {
      this.form.markAllAsTouched();
      return;
    }
    this.busy.set(true);
    this.failure.set(null);
    const { name, scope, expiresInDays } = this.form.getRawValue();
    this.http
      .post<TokenCreated>('/api/tokens', { name: name.trim(), scope, expiresInDays: Number(expiresInDays) }, { context: new HttpContext().set(ERRORS_SHOWN_INLINE, true) })
      .subscribe({
        next: (result) => {
          this.busy.set(false);
          this.created.set(result);
          formDirective.resetForm({ name: '', scope, expiresInDays });
          this.tokens.reload();
        },
        error: (error: unknown) => {
          this.busy.set(false);
          if (!(error instanceof ApiError)) this.failure.set('The token could not be created. Try again.');
          else if (!showServerErrors(this.form, error)) this.failure.set(error.message);
        },
      });
  }

  protected copySecret(secret: string): void {
    navigator.clipboard.writeText(secret).then(
      () => this.notifier.info('Token copied to the clipboard'),
      () => this.notifier.error('The browser did not allow copying; select the token and copy it by hand'),
    );
  }

  protected dismissSecret(): void {
    this.created.set(null);
  }

  protected revokeToken(token: ApiTokenView): void {
    if (!confirm(`Revoke "${token.name}"? Scripts using it stop working at once.`)) return;
    this.http.delete<{ token: ApiTokenView }>(`/api/tokens/${token.id}`).subscribe(() => {
      this.notifier.info(`"${token.name}" is revoked`);
      if (this.created()?.token.id === token.id) this.created.set(null);
      this.tokens.reload();
    });
  }
}
