import type { ProcessingEvent } from '../../src/contracts/processing';

/** A server-sent-events stream being read in the background. */
export interface FollowedStream {
  /** Every `event: item` message so far, in order. */
  readonly events: ProcessingEvent[];
  /** Resolves once `test` holds for a message (already received or later), or rejects after `ms`. */
  waitFor(test: (e: ProcessingEvent) => boolean, ms?: number): Promise<ProcessingEvent>;
  close(): void;
}

/** Opens `url` (an athlete's processing-events stream) with the session cookie and collects its messages. */
export async function followProcessingEvents(url: string, cookie: string): Promise<FollowedStream> {
  const controller = new AbortController();
  const res = await fetch(url, { headers: { cookie }, signal: controller.signal });
  if (res.status !== 200 || !res.body) throw new Error(`stream answered ${res.status}`);
  const events: ProcessingEvent[] = [];
  const waiters = new Set<() => void>();
  void (async () => {
    const decoder = new TextDecoder();
    let buffer = '';
    try {
      for await (const chunk of res.body as unknown as AsyncIterable<Uint8Array>) {
        buffer += decoder.decode(chunk, { stream: true });
        let end: number;
        while ((end = buffer.indexOf('\n\n')) >= 0) {
          const block = buffer.slice(0, end);
          buffer = buffer.slice(end + 2);
          const data = block
            .split('\n')
            .filter((l) => l.startsWith('data: '))
            .map((l) => l.slice(6))
            .join('\n');
          if (block.includes('event: item') && data) events.push(JSON.parse(data) as ProcessingEvent);
        }
        waiters.forEach((w) => w());
      }
    } catch {
      // closed
    }
  })();
  return {
    events,
    waitFor(test, ms = 60_000) {
      return new Promise((resolve, reject) => {
        const check = () => {
          const found = events.find(test);
          if (found) {
            waiters.delete(check);
            clearTimeout(timer);
            resolve(found);
          }
        };
        const timer = setTimeout(() => {
          waiters.delete(check);
          reject(new Error(`no such event in ${ms} ms (${events.length} received)`));
        }, ms);
        waiters.add(check);
        check();
      });
    },
    close: () => controller.abort(),
  };
}
