import { describe, expect, it } from 'vitest';
import { sharedReads } from '#lib/server/shared-reads.ts';

// A read that the test finishes by hand, numbering each start, so it can be seen which callers
// shared which read.
function manualReads() {
  const started: { n: number; finish: (ok: boolean) => void }[] = [];
  const read = () =>
    new Promise<number>((resolve, reject) => {
      const n = started.length + 1;
      started.push({
        n,
        finish: (ok) => (ok ? resolve(n) : reject(new Error(`read ${n} failed`))),
      });
    });
  return { started, read };
}
const settle = () => new Promise((r) => setImmediate(r));

describe('sharedReads', () => {
  it('starts a read at once when none is under way', async () => {
    const { started, read } = manualReads();
    const get = sharedReads(read);
    const a = get();
    expect(started).toHaveLength(1);
    started[0]!.finish(true);
    expect(await a).toBe(1);
  });

  it('never hands a caller a read that started before it arrived; latecomers share the next', async () => {
    const { started, read } = manualReads();
    const get = sharedReads(read);
    const early = get();
    const late = [get(), get(), get()];
    expect(started).toHaveLength(1); // the latecomers wait rather than join read 1
    started[0]!.finish(true);
    expect(await early).toBe(1);
    await settle();
    expect(started).toHaveLength(2);
    const later = get(); // arrives while read 2 is under way
    started[1]!.finish(true);
    expect(await Promise.all(late)).toEqual([2, 2, 2]);
    await settle();
    started[2]!.finish(true);
    expect(await later).toBe(3);
    expect(started).toHaveLength(3);
  });

  it('gives a failure to the callers of that read only', async () => {
    const { started, read } = manualReads();
    const get = sharedReads(read);
    const a = get();
    const b = get();
    started[0]!.finish(false);
    await expect(a).rejects.toThrow('read 1 failed');
    await settle();
    started[1]!.finish(true);
    expect(await b).toBe(2);
    const c = get();
    await settle();
    expect(started).toHaveLength(3);
    started[2]!.finish(true);
    expect(await c).toBe(3);
  });

  it('survives a read that throws before returning a promise', async () => {
    let calls = 0;
    const get = sharedReads(() => {
      calls++;
      if (calls === 1) throw new Error('refused at once');
      return Promise.resolve(calls);
    });
    await expect(get()).rejects.toThrow('refused at once');
    expect(await get()).toBe(2);
  });
});
