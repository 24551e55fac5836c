import { provideHttpClient, withInterceptors, withXsrfConfiguration } from '@angular/common/http';
import {
  ApplicationConfig,
  ErrorHandler,
  inject,
  provideAppInitializer,
  provideBrowserGlobalErrorListeners,
  provideZonelessChangeDetection,
} from '@angular/core';
import { MatIconRegistry } from '@angular/material/icon';
import { provideRouter, withComponentInputBinding } from '@angular/router';
import { provideEchartsCore } from 'ngx-echarts';
import { routes } from './app.routes';
import { AuthStore } from './auth/auth-store';
import { AppConfigStore } from './core/app-config';
import { AppErrorHandler } from './core/app-error-handler';
import { errorInterceptor } from './core/error-interceptor';

export const appConfig: ApplicationConfig = {
  providers: [
    provideZonelessChangeDetection(),
    provideBrowserGlobalErrorListeners(),
    { provide: ErrorHandler, useClass: AppErrorHandler },
    provideRouter(routes, withComponentInputBinding()),
    provideHttpClient(
      // The server sets XSRF-TOKEN (on GET /api/me) and checks the header on every state-changing call.
      withXsrfConfiguration({ cookieName: 'XSRF-TOKEN', headerName: 'X-XSRF-TOKEN' }),
      withInterceptors([errorInterceptor]),
    ),
    provideEchartsCore({ echarts: () => import('./core/echarts-setup').then((m) => m.echarts) }),
    provideAppInitializer(() => {
      // Icons come from the material-symbols npm package (see angular.json styles), not a CDN.
      inject(MatIconRegistry).setDefaultFontSetClass('material-symbols-outlined');
      // Knowing who is signed in (and getting the XSRF cookie) before the first route decides anything.
      return Promise.all([inject(AuthStore).ready(), inject(AppConfigStore).ready()]);
    }),
  ],
};
