// A small in-memory sliding-window limiter for the public check page, per client IP. It lives in
// the server process, so it is right for one server; several servers behind a balancer would each
// count separately (then move the counts to a shared store).
export type RateLimiter = { hit: (key: string, now?: number) => boolean; reset: () => void };

export function createRateLimiter(input: { limit: number; windowMs: number; maxKeys?: number }): RateLimiter {
  const hits = new Map<string, number[]>();
  const maxKeys = input.maxKeys ?? 10_000;
  return {
    /** Records a request; false when the key is over its limit in the window. */
    hit(key, now = Date.now()) {
      const recent = (hits.get(key) ?? []).filter((t) => now - t < input.windowMs);
      const allowed = recent.length < input.limit;
      if (allowed) recent.push(now);
      hits.delete(key);
      hits.set(key, recent);
      // Forget the oldest keys first so a flood of addresses cannot grow memory without bound.
      while (hits.size > maxKeys) hits.delete(hits.keys().next().value as string);
      return allowed;
    },
    reset() {
      hits.clear();
    },
  };
}

const holder = globalThis as unknown as { __hearthmarkCheckLimiter?: RateLimiter };

/** 30 checks a minute per IP: plenty for people scanning certificates, slow for anyone guessing. */
export function checkPageLimiter(): RateLimiter {
  holder.__hearthmarkCheckLimiter ??= createRateLimiter({ limit: 30, windowMs: 60_000 });
  return holder.__hearthmarkCheckLimiter;
}
