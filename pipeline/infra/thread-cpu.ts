/**
 * CPU time of the calling thread [ns], for benchmarks on a shared machine where wall clock is
 * noisy: the first field of Linux's /proc/thread-self/schedstat (time on a CPU, ns). NaN where
 * that file does not exist (then fall back to `process.cpuUsage`, which counts all threads).
 */
import { readFileSync } from 'node:fs';

export function threadCpuNs(): number {
  try {
    return Number(readFileSync('/proc/thread-self/schedstat', 'utf8').split(' ')[0]);
  } catch {
    return NaN;
  }
}
