/**
 * Preloaded into a benchmarked server (`BENCH_NODE_IMPORT=./test/bench/support/loop-delay.mjs`, with
 * `--keep`): every second it writes the event loop's delay (median, p99, longest) and the heap in use
 * to the server's log as `loop-delay …` lines, to tell long stalls (collections, waiting for a core)
 * from slow requests.
 */
import { monitorEventLoopDelay } from 'node:perf_hooks';

const delay = monitorEventLoopDelay({ resolution: 5 });
delay.enable();
const ms = (ns) => (ns / 1e6).toFixed(1);
setInterval(() => {
  process.stderr.write(
    `loop-delay ${new Date().toISOString()} p50 ${ms(delay.percentile(50))} p99 ${ms(delay.percentile(99))} max ${ms(delay.max)} ms ` +
      `heap ${(process.memoryUsage().heapUsed / 1e6).toFixed(0)} MB\n`,
  );
  delay.reset();
}, 1000).unref();
