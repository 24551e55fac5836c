import autocannon from 'autocannon';

export interface LoadFigure {
  name: string;
  connections: number;
  requests: number;
  errors: number;
  non2xx: number;
  p50: number;
  p95: number;
  p99: number;
  rps: number;
}

/** Nearest-rank percentile of sorted samples (common practice, no source). */
function percentile(sorted: number[], p: number): number {
  if (!sorted.length) return NaN;
  return sorted[Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1))]!;
}

/**
 * One autocannon run. autocannon's own histogram reports p97.5 but not p95, so every response time
 * is collected from its 'response' event and the percentiles are taken from those samples.
 */
export async function load(name: string, opts: { url: string; connections: number; seconds: number; method?: 'GET' | 'POST'; headers: Record<string, string>; body?: string }): Promise<LoadFigure> {
  const samples: number[] = [];
  const instance = autocannon({
    url: opts.url,
    connections: opts.connections,
    duration: opts.seconds,
    method: opts.method ?? 'GET',
    headers: opts.headers,
    body: opts.body,
  });
  instance.on('response', (_client: unknown, _status: number, _bytes: number, responseTime: number) => samples.push(responseTime));
  const result = await instance;
  samples.sort((a, b) => a - b);
  return {
    name,
    connections: opts.connections,
    requests: result.requests.total,
    errors: result.errors,
    non2xx: result.non2xx,
    p50: percentile(samples, 50),
    p95: percentile(samples, 95),
    p99: percentile(samples, 99),
    rps: result.requests.average,
  };
}
