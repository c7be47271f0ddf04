// Time and memory growth of one piece of work, sampled every 5 ms (peak RSS and heap above where it started).
export function mb(bytes: number): string {
  return `${(bytes / 1048576).toFixed(1)} MB`;
}

export async function measure<T>(f: () => Promise<T> | T): Promise<{ ms: number; rss: number; heap: number; value: T }> {
  global.gc?.();
  const base = process.memoryUsage();
  let rss = 0,
    heap = 0;
  const timer = setInterval(() => {
    const m = process.memoryUsage();
    rss = Math.max(rss, m.rss - base.rss);
    heap = Math.max(heap, m.heapUsed - base.heapUsed);
  }, 5);
  const t0 = performance.now();
  const value = await f();
  const ms = performance.now() - t0;
  clearInterval(timer);
  const m = process.memoryUsage();
  return { ms, rss: Math.max(rss, m.rss - base.rss), heap: Math.max(heap, m.heapUsed - base.heapUsed), value };
}
