// One read shared by the callers who waited for it together.

/**
 * Wraps a read so that concurrent callers share it without ever getting a stale value: a caller
 * waits for a read that starts after it arrived (never joins one already under way), and all who
 * arrived while a read was under way share the next one. Under load one query serves many
 * callers, and each still sees every change committed before it called.
 */
export function sharedReads<T>(read: () => Promise<T>): () => Promise<T> {
  let next: { promise: Promise<T>; resolve: (v: T) => void; reject: (e: unknown) => void } | null =
    null;
  let underWay = false;
  const start = () => {
    const batch = next!;
    next = null;
    underWay = true;
    new Promise<T>((resolve) => resolve(read())).then(batch.resolve, batch.reject).finally(() => {
      underWay = false;
      if (next) start();
    });
  };
  return () => {
    if (next) return next.promise;
    let resolve!: (v: T) => void;
    let reject!: (e: unknown) => void;
    const promise = new Promise<T>((res, rej) => ((resolve = res), (reject = rej)));
    next = { promise, resolve, reject };
    if (!underWay) start();
    return promise;
  };
}
