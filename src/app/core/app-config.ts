import { HttpClient } from '@angular/common/http';
import { Injectable, inject, signal } from '@angular/core';
import { firstValueFrom } from 'rxjs';

/** The public part of the server's configuration (GET /api/config). */
export interface PublicConfig {
  version: string;
  /** True while the built-in fake SMTP server is catching mail (development, demo, tests). */
  mailFake: boolean;
  /** True when the demo accounts were seeded. */
  demo: boolean;
}

const UNKNOWN: PublicConfig = { version: '', mailFake: false, demo: false };

@Injectable({ providedIn: 'root' })
export class AppConfigStore {
  private readonly http = inject(HttpClient);
  private readonly current = signal<PublicConfig>(UNKNOWN);
  private loading: Promise<void> | null = null;

  readonly config = this.current.asReadonly();

  ready(): Promise<void> {
    this.loading ??= firstValueFrom(this.http.get<PublicConfig>('/api/config')).then(
      (config) => this.current.set(config),
      // The interceptor has shown why; without the config the app hides the optional parts (outbox, demo hints).
      () => this.current.set(UNKNOWN),
    );
    return this.loading;
  }
}
