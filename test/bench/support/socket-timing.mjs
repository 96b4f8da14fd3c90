/**
 * Preloaded into a benchmarked server (`BENCH_NODE_IMPORT=./test/bench/support/socket-timing.mjs`,
 * with `--keep`): for every request it notes, per socket, how long after the previous answer on
 * that socket finished the request arrived (the client's side of the turn: its read, its next
 * write, the loopback) and how long the server took from the request's arrival to its answer
 * handed to the socket. Every 5 s and at exit it writes the percentiles to the server's log as a
 * `socket-timing …` line — the server's own view, to set beside a load tool's latency figures.
 */
import http from 'node:http';
import { performance } from 'node:perf_hooks';

const gaps = [];
const serving = [];
const last = new WeakMap();
const emit = http.Server.prototype.emit;
http.Server.prototype.emit = function (event, ...args) {
  if (event === 'request') {
    const [req, res] = args;
    const socket = req.socket;
    const arrived = performance.now();
    const before = last.get(socket);
    if (before !== undefined) gaps.push(arrived - before);
    res.once('finish', () => {
      const done = performance.now();
      serving.push(done - arrived);
      last.set(socket, done);
    });
  }
  return emit.call(this, event, ...args);
};

const at = (xs, q) => {
  const sorted = [...xs].sort((a, b) => a - b);
  return sorted.length ? sorted[Math.min(sorted.length - 1, Math.floor(sorted.length * q))].toFixed(1) : '–';
};
const report = () => {
  if (!serving.length) return;
  process.stderr.write(
    `socket-timing ${new Date().toISOString()} requests ${serving.length}; ` +
      `arrival after the socket's last answer p50 ${at(gaps, 0.5)} p99 ${at(gaps, 0.99)} max ${at(gaps, 1)} ms; ` +
      `arrival to answer p50 ${at(serving, 0.5)} p99 ${at(serving, 0.99)} max ${at(serving, 1)} ms\n`,
  );
  gaps.length = 0;
  serving.length = 0;
};
setInterval(report, 5000).unref();
process.on('exit', report);
