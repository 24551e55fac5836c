import { DOCUMENT, Injectable, computed, effect, inject, signal } from '@angular/core';

export type ColorSchemeChoice = 'system' | 'light' | 'dark';
const STORAGE_KEY = 'specimetry.color-scheme';

/**
 * Light / dark: follows the operating system unless the user picked one in the top bar. The theme
 * uses CSS light-dark(), so setting `color-scheme` on <html> is all it takes to switch.
 */
@Injectable({ providedIn: 'root' })
export class ColorScheme {
  private readonly document = inject(DOCUMENT);
  private readonly media = this.document.defaultView?.matchMedia?.('(prefers-color-scheme: dark)') ?? null;
  private readonly systemDark = signal(this.media?.matches ?? false);

  readonly choice = signal<ColorSchemeChoice>(this.readStored());
  readonly isDark = computed(() => (this.choice() === 'system' ? this.systemDark() : this.choice() === 'dark'));

  constructor() {
    this.media?.addEventListener('change', (e) => this.systemDark.set(e.matches));
    effect(() => {
      const choice = this.choice();
      this.document.documentElement.style.colorScheme = choice === 'system' ? '' : choice;
      this.store(choice);
    });
  }

  choose(choice: ColorSchemeChoice): void {
    this.choice.set(choice);
  }

  private readStored(): ColorSchemeChoice {
    const value = this.storage()?.getItem(STORAGE_KEY);
    return value === 'light' || value === 'dark' ? value : 'system';
  }

  private store(choice: ColorSchemeChoice): void {
    const storage = this.storage();
    if (choice === 'system') storage?.removeItem(STORAGE_KEY);
    else storage?.setItem(STORAGE_KEY, choice);
  }

  private storage(): Storage | null {
    try {
      return this.document.defaultView?.localStorage ?? null;
    } catch {
      // Browsers throw SecurityError on localStorage access when site data is blocked; then the choice lasts the visit.
      return null;
    }
  }
}
