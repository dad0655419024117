// The slice of autocannon's programmatic API the benchmark uses (the package ships no types).
declare module 'autocannon' {
  interface RequestParams {
    method?: string;
    path?: string;
    headers?: Record<string, string>;
    body?: string;
  }
  interface Options {
    url: string;
    connections?: number;
    duration?: number;
    method?: string;
    headers?: Record<string, string>;
    body?: string;
    requests?: Array<RequestParams & { setupRequest?: (req: RequestParams, context: Record<string, unknown>) => RequestParams }>;
  }
  interface Histogram {
    average: number;
    mean: number;
    p50: number;
    p90: number;
    p99: number;
    max: number;
  }
  interface Result {
    requests: Histogram & { total: number; sent: number };
    latency: Histogram;
    errors: number;
    timeouts: number;
    non2xx: number;
    '2xx': number;
    duration: number;
  }
  function autocannon(options: Options): Promise<Result>;
  export default autocannon;
}
