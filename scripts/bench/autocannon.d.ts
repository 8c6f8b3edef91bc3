// The part of autocannon's API the bench uses (the package ships no types).
declare module "autocannon" {
  type Options = { url: string; connections?: number; duration?: number; headers?: Record<string, string> };
  type Histogram = { p50: number; p99: number; average: number; max: number };
  type Result = { latency: Histogram; requests: Histogram & { total: number }; non2xx: number; errors: number; timeouts: number; statusCodeStats?: Record<string, { count: number }> };
  function autocannon(options: Options): Promise<Result>;
  export default autocannon;
}
