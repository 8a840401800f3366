// autocannon ships no types: the options and result fields the benchmark uses.
declare module 'autocannon' {
  namespace autocannon {
    interface Options {
      url: string;
      method?: string;
      headers?: Record<string, string>;
      body?: string;
      connections?: number;
      duration?: number;
      amount?: number;
      [key: string]: unknown;
    }
    interface Histogram {
      average: number;
      p50: number;
      p99: number;
      [key: string]: number;
    }
    interface Result {
      requests: Histogram & { total: number };
      latency: Histogram;
      errors: number;
      timeouts: number;
      non2xx: number;
      [key: string]: unknown;
    }
  }
  function autocannon(opts: autocannon.Options): Promise<autocannon.Result>;
  export default autocannon;
}
