// The few parts of autocannon's programmatic API that tests/bench/run.ts uses (the package ships no types).
declare module "autocannon" {
  interface Histogram {
    average: number;
    p50: number;
    p99: number;
    total: number;
  }
  interface Result {
    requests: Histogram;
    latency: Histogram;
    non2xx: number;
    errors: number;
    timeouts: number;
  }
  interface Options {
    url: string;
    connections?: number;
    duration?: number;
    requests?: Array<{ setupRequest?: (request: Record<string, unknown>, context: Record<string, unknown>) => Record<string, unknown> }>;
  }
  export type { Result };
  export default function autocannon(options: Options): Promise<Result>;
}
