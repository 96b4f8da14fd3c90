import { newLogKey } from './plan-words';

/**
 * The `Idempotency-Key` of a create form: saving the same content again (a retry after the answer
 * was lost, a second click) sends the same key, so the server answers what it made instead of
 * making a second; changed content gets a new key (it is another request).
 */
export class RetryKeys {
  private last: { content: string; key: string } | null = null;

  constructor(private readonly makeKey: () => string = newLogKey) {}

  /** The key for sending `content`. */
  for(content: unknown): string {
    const c = JSON.stringify(content);
    if (this.last?.content !== c) this.last = { content: c, key: this.makeKey() };
    return this.last.key;
  }

  /** After a save that succeeded: the next one, even with the same content, is a new request. */
  reset(): void {
    this.last = null;
  }
}
