import { describe, expect, it } from 'vitest';
import { inTurn } from '@/utils/inTurn';

describe('inTurn', () => {
  it('runs queued pieces in order, each in a task of its own', async () => {
    const seen: string[] = [];
    const piece = (name: string) => () => {
      seen.push(name);
      // Runs before the next piece only if that piece waits for a new task.
      queueMicrotask(() => seen.push(`${name} after`));
      return name;
    };
    const results = await Promise.all([inTurn(piece('a')), inTurn(piece('b')), inTurn(piece('c'))]);
    expect(results).toEqual(['a', 'b', 'c']);
    expect(seen).toEqual(['a', 'a after', 'b', 'b after', 'c', 'c after']);
  });

  it('does not start anything in the caller’s task', async () => {
    let ran = false;
    const done = inTurn(() => (ran = true));
    expect(ran).toBe(false);
    await done;
    expect(ran).toBe(true);
  });

  it('passes a piece’s failure to its caller and goes on with the rest', async () => {
    const failing = inTurn(() => {
      throw new Error('no chart');
    });
    const next = inTurn(async () => 'drawn');
    await expect(failing).rejects.toThrow('no chart');
    await expect(next).resolves.toBe('drawn');
  });
});
