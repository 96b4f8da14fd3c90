import { provideHttpClient, withInterceptors, withXsrfConfiguration } from '@angular/common/http';
import { registerLocaleData } from '@angular/common';
import localeEnGb from '@angular/common/locales/en-GB';
import {
  ApplicationConfig,
  LOCALE_ID,
  inject,
  provideAppInitializer,
  provideBrowserGlobalErrorListeners,
  provideZonelessChangeDetection,
} from '@angular/core';
import { MAT_FORM_FIELD_DEFAULT_OPTIONS } from '@angular/material/form-field';
import { MatIconRegistry } from '@angular/material/icon';
import { provideRouter, withComponentInputBinding, withNavigationErrorHandler } from '@angular/router';

import { routes } from './app.routes';
import { AuthStore } from './core/auth-store';
import { ConfigStore } from './core/config-store';
import { csrfRetryInterceptor } from './core/csrf-retry-interceptor';
import { errorInterceptor } from './core/error-interceptor';
import { reloadOnStaleBuild } from './core/stale-build';
import { provideIsoDateAdapter } from './shared/iso-date-adapter';

// Dates read day first ("6 Oct 2026"), as in the stills and visit summaries the server renders.
registerLocaleData(localeEnGb);

export const appConfig: ApplicationConfig = {
  providers: [
    { provide: LOCALE_ID, useValue: 'en-GB' },
    provideBrowserGlobalErrorListeners(),
    provideZonelessChangeDetection(),
    // After an update, a page still pointing at the old build's chunks reloads from the server.
    provideRouter(
      routes,
      withComponentInputBinding(),
      withNavigationErrorHandler((e) => reloadOnStaleBuild(e)),
    ),
    provideHttpClient(
      // The error interceptor sees only the last answer: a stale token is refreshed and retried inside it.
      withInterceptors([errorInterceptor, csrfRetryInterceptor]),
      withXsrfConfiguration({ cookieName: 'XSRF-TOKEN', headerName: 'X-XSRF-TOKEN' }),
    ),
    provideIsoDateAdapter(),
    { provide: MAT_FORM_FIELD_DEFAULT_OPTIONS, useValue: { appearance: 'outline' } },
    provideAppInitializer(() => {
      inject(MatIconRegistry).setDefaultFontSetClass('material-symbols-outlined');
      const auth = inject(AuthStore);
      const config = inject(ConfigStore);
      // First the session and XSRF cookie (one request, so parallel first requests cannot each
      // start their own session), then who is signed in and the public config.
      return auth
        .ensureCsrf()
        .then(() => Promise.all([auth.load(), config.load()]))
        .then(() => undefined);
    }),
  ],
};
