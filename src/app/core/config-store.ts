import { HttpClient } from '@angular/common/http';
import { Injectable, computed, inject, signal } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import type { AppConfig } from '../../contracts/api';
import { skipErrorSnackbar } from './http-context';

/** Public app configuration (`GET /api/config`), loaded once at startup. */
@Injectable({ providedIn: 'root' })
export class ConfigStore {
  private readonly http = inject(HttpClient);
  private readonly config = signal<AppConfig | null>(null);

  /** Whether demo helpers (demo sign-in note, demo inbox hints) are on. False until loaded. */
  readonly demoMode = computed(() => this.config()?.demoMode ?? false);
  /** Demo mode: where the demo's e-mail can be read on the machine running it; null otherwise. */
  readonly demoInboxUrl = computed(() => this.config()?.demoInboxUrl ?? null);
  readonly version = computed(() => this.config()?.version ?? null);
  /** Largest clip the server accepts, bytes; null until loaded. */
  readonly uploadMaxBytes = computed(() => this.config()?.uploadMaxBytes ?? null);

  /** Loads the configuration; on failure the app runs with demo helpers off. */
  async load(): Promise<void> {
    try {
      this.config.set(await firstValueFrom(this.http.get<AppConfig>('/api/config', { context: skipErrorSnackbar() })));
    } catch {
      this.config.set(null);
    }
  }
}
