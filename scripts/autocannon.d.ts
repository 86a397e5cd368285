// The part of autocannon's API that scripts/loadtest.ts uses (the package ships no types).
declare module 'autocannon' {
  namespace autocannon {
    interface Request {
      method?: string;
      path?: string;
      headers?: Record<string, string>;
      body?: string;
      setupRequest?: (req: Request, context: any) => Request | null;
      onResponse?: (status: number, body: string, context: any, headers: Record<string, string>) => void;
    }
    interface Options {
      url?: string;
      connections?: number;
      duration?: number;
      amount?: number;
      timeout?: number;
      method?: string;
      headers?: Record<string, string>;
      body?: string;
      requests?: Request[];
    }
    interface Histogram {
      average: number;
      p50: number;
      p99: number;
      total: number;
    }
    interface Result {
      requests: Histogram;
      latency: Histogram;
      errors: number;
      timeouts: number;
      '5xx': number;
      statusCodeStats?: Record<string, { count: number }>;
    }
  }
  function autocannon(opts: autocannon.Options): Promise<autocannon.Result>;
  export default autocannon;
}
