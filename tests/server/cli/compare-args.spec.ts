import { describe, expect, it } from 'vitest';
import { parseCompareArgs, UsageError } from '../../../server/cli/compare-args.js';

describe('parseCompareArgs', () => {
  it('reads files, numbers, tooth lists and gear overrides into compare options', () => {
    const args = parseCompareArgs([
      '--reference', 'ref.fit', '--test', 'a.fit', '--test', 'b.csv', '--tolerance', '1.5', '--interval', '0.5',
      '--offset', '-12', '--chainrings', '53,39', '--cogs', '11-13,15', '--wheel', '25-622', '--front-override', '2700-2940:34', '--json',
    ]);
    expect(args).toMatchObject({ referencePath: 'ref.fit', testPaths: ['a.fit', 'b.csv'], json: true });
    expect(args.options).toEqual({
      tolerancePct: 1.5,
      intervalS: 0.5,
      offset: -12,
      chainrings: [53, 39],
      cogs: [11, 12, 13, 15],
      wheel: '25-622',
      gearOverrides: [{ startS: 2700, endS: 2940, frontTeeth: 34 }],
    });
  });

  it('takes a wheel circumference in mm as a number and auto as the default offset', () => {
    const args = parseCompareArgs(['--reference', 'r.fit', '--test', 't.fit', '--wheel', '2105', '--offset', 'auto']);
    expect(args.options).toEqual({ wheel: 2105 });
  });

  it.each([
    [['--reference', 'r.fit', '--test', 't.fit', '--tolerance', '0'], /--tolerance must be above 0/],
    [['--reference', 'r.fit', '--test', 't.fit', '--cogs', '11-x'], /--cogs needs tooth counts/],
    [['--reference', 'r.fit', '--test', 't.fit', '--segments', 'all'], /--segments must be steady or laps/],
    [['--reference', 'r.fit', '--test', 't.fit', 'extra'], /see --help/],
  ])('refuses %j with one message', (argv, message) => {
    expect(() => parseCompareArgs(argv)).toThrow(UsageError);
    expect(() => parseCompareArgs(argv)).toThrow(message);
  });
});
