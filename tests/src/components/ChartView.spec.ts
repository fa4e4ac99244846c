import { flushPromises, mount } from '@vue/test-utils';
import { describe, expect, it } from 'vitest';
import { tracesSpec } from '../../../shared/charts/traces.js';
import ChartView from '@/components/ChartView.vue';

/** Polls until `check` holds (vega draws asynchronously). */
async function until(what: string, check: () => boolean, timeoutMs = 20_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!check()) {
    if (Date.now() > deadline) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 50));
    await flushPromises();
  }
}

/** Rows of the chart's data as the CSV export gives them: "t,value,device" lines. */
function rowsOf(csv: string): { t: number; value: number }[] {
  return csv.trim().split('\n').slice(1).map((line) => {
    const [t, value] = line.split(',');
    return { t: Number(t), value: Number(value) };
  });
}

describe('ChartView zoom', () => {
  // 4 h at 1 Hz; every sample differs from its neighbours, so a reduced window is easy to tell from the original.
  const n = 14_400;
  const timeS = Float64Array.from({ length: n }, (_, i) => i);
  const power = Float64Array.from({ length: n }, (_, i) => 150 + ((i * 7919) % 101));
  const spec = tracesSpec({ timeS, series: [{ label: 'Reference', colourIndex: 0, values: power }] });

  it('draws the reduced ride, and after zooming into one minute every original sample of it', async () => {
    const wrapper = mount(ChartView, { props: { spec, name: 'power', height: 120 }, attachTo: document.body });
    await until('the chart', () => wrapper.get('figure').attributes('data-ready') === 'true');
    const vm = wrapper.vm as unknown as { dataAsCsv(): string; zoomTo(x0: number, x1: number): Promise<void> };

    const reduced = rowsOf(vm.dataAsCsv());
    expect(reduced.length).toBeLessThanOrEqual(2000);
    const reducedInWindow = reduced.filter((r) => r.t >= 3600 && r.t <= 3660);
    // 14 400 samples into 1000 buckets of two: a minute holds only a handful of the reduced points.
    expect(reducedInWindow.length).toBeLessThan(20);
    expect(wrapper.get('figure').attributes('data-detail')).toBe('reduced');

    await vm.zoomTo(3600, 3660);
    await until('the zoomed range', () => wrapper.get('figure').attributes('data-detail') === 'range');
    // Longer than the listener's delay: a zoom event must not put the reduced rows back.
    await new Promise((r) => setTimeout(r, 400));
    await flushPromises();
    expect(wrapper.get('figure').attributes('data-detail')).toBe('range');
    expect(wrapper.get('figure').attributes('data-visible')).toBe('3600,3660');
    const zoomed = rowsOf(vm.dataAsCsv());
    // The 61 samples of the window plus one either side, exactly as recorded.
    expect(zoomed.map((r) => r.t)).toEqual(Array.from({ length: 63 }, (_, k) => 3599 + k));
    for (const r of zoomed) expect(r.value).toBe(power[r.t]);
    expect(wrapper.text()).toContain('Every recorded sample of this range.');
    wrapper.unmount();
  }, 60_000);

  it('keeps a short series as it is, without zoom data', async () => {
    const short = tracesSpec({ timeS: [0, 1, 2], series: [{ label: 'Reference', colourIndex: 0, values: [1, 2, 3] }] });
    expect((short as { usermeta?: unknown }).usermeta).toBeUndefined();
    const wrapper = mount(ChartView, { props: { spec: short }, attachTo: document.body });
    await until('the chart', () => wrapper.get('figure').attributes('data-ready') === 'true');
    expect(wrapper.get('figure').attributes('data-detail')).toBeUndefined();
    wrapper.unmount();
  }, 60_000);
});
