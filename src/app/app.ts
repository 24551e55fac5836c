import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatListModule } from '@angular/material/list';
import { MatMenuModule } from '@angular/material/menu';
import { MatTooltipModule } from '@angular/material/tooltip';
import { Router, RouterLink, RouterLinkActive, RouterOutlet } from '@angular/router';
import { AuthStore } from './auth/auth-store';
import { AppConfigStore } from './core/app-config';
import { BrandMark } from './core/brand-mark';
import { ColorScheme, ColorSchemeChoice } from './core/color-scheme';
import { groupBySection, navigationFor } from './core/navigation';
import { NotificationBell } from './notifications/notification-bell';

/** The app shell: top bar, role-based navigation, and the routed page. */
@Component({
  selector: 'sm-root',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [
    RouterOutlet,
    RouterLink,
    RouterLinkActive,
    MatButtonModule,
    MatIconModule,
    MatListModule,
    MatMenuModule,
    MatTooltipModule,
    BrandMark,
    NotificationBell,
  ],
  templateUrl: './app.html',
  styleUrl: './app.scss',
})
export class App {
  private readonly auth = inject(AuthStore);
  private readonly router = inject(Router);
  private readonly appConfig = inject(AppConfigStore);
  protected readonly colorScheme = inject(ColorScheme);

  protected readonly user = this.auth.user;
  protected readonly roleLabel = this.auth.roleLabel;
  protected readonly navGroups = computed(() => groupBySection(navigationFor(this.auth.role(), this.appConfig.config())));
  protected readonly version = computed(() => this.appConfig.config().version);
  protected readonly schemeIcon = computed(() => (this.colorScheme.isDark() ? 'dark_mode' : 'light_mode'));
  protected readonly schemeChoices: { value: ColorSchemeChoice; label: string; icon: string }[] = [
    { value: 'system', label: 'Follow the system', icon: 'contrast' },
    { value: 'light', label: 'Light', icon: 'light_mode' },
    { value: 'dark', label: 'Dark', icon: 'dark_mode' },
  ];

  protected signOut(): void {
    this.auth.signOut().subscribe(() => void this.router.navigate(['/sign-in']));
  }
}
