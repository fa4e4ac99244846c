import { flushPromises, mount } from '@vue/test-utils';
import { afterEach, describe, expect, it, vi } from 'vitest';
import type { Snapshot } from '../../../../shared/api/snapshots.js';
import SnapshotChart from '@/components/snapshot/SnapshotChart.vue';
import SnapshotView from '@/components/snapshot/SnapshotView.vue';

const chartPng = vi.fn(async (_spec: Record<string, unknown>, _width: number) => 'data:image/png;base64,AAAA');
vi.mock('@/components/snapshot/chartPng', () => ({ chartPng }));

const SVG = '<svg class="marks" width="816" height="300" viewBox="0 0 816 300"><g><path d="M0,0L10,10"/><text>Left leg</text></g></svg>';
const spec = { title: 'Difference by leg', mark: 'bar', data: { values: [{ leg: 'left', pct: 5.01 }, { leg: 'right', pct: 0.04 }] } };

function snapshotWith(svg: string | undefined): Snapshot {
  return {
    snapshotVersion: 1,
    revision: 2,
    computedAt: '2026-03-01T10:00:00Z',
    durationMs: 10,
    inputs: [],
    cells: [{ cellId: 'c1', name: 'leg_bars', kind: 'chart', state: 'fresh', durationMs: 2, result: { type: 'chart', spec, ...(svg ? { svg } : {}) }, warnings: [] }],
  };
}

/** Downloads the component starts: the link's file name and the text behind its address. */
function watchDownloads() {
  const saved: { name: string; href: string; blob?: Blob }[] = [];
  const blobs = new Map<string, Blob>();
  let n = 0;
  vi.stubGlobal('URL', Object.assign(URL, { createObjectURL: (b: Blob) => { const u = `blob:test/${++n}`; blobs.set(u, b); return u; }, revokeObjectURL: () => undefined }));
  vi.spyOn(HTMLAnchorElement.prototype, 'click').mockImplementation(function (this: HTMLAnchorElement) {
    saved.push({ name: this.download, href: this.getAttribute('href')!, ...(blobs.has(this.getAttribute('href')!) ? { blob: blobs.get(this.getAttribute('href')!)! } : {}) });
  });
  return saved;
}

afterEach(() => {
  vi.restoreAllMocks();
  vi.unstubAllGlobals();
  chartPng.mockClear();
  document.body.innerHTML = '';
});

describe('a stored chart the server drew', () => {
  it('is shown as the server drew it, ready at once, without the live chart view', () => {
    const wrapper = mount(SnapshotView, { props: { snapshot: snapshotWith(SVG) }, global: { stubs: { ChartView: { template: '<figure class="live-chart" />' } } } });
    const figure = wrapper.get('[data-snapshot-cell=leg_bars] .chart-view');
    expect(figure.attributes('data-ready')).toBe('true');
    expect(figure.attributes('data-drawn')).toBe('server');
    expect(figure.find('.chart-view__canvas svg.marks').exists()).toBe(true);
    expect(figure.get('.chart-view__canvas text').text()).toBe('Left leg');
    expect(wrapper.find('.live-chart').exists()).toBe(false);
  });

  it('falls back to the live chart view for a chart stored without a drawing', async () => {
    const wrapper = mount(SnapshotView, { props: { snapshot: snapshotWith(undefined) }, global: { stubs: { ChartView: { template: '<figure class="live-chart" />' } } } });
    await flushPromises();
    await vi.waitFor(() => expect(wrapper.find('.live-chart').exists()).toBe(true));
    expect(wrapper.find('[data-drawn=server]').exists()).toBe(false);
  });

  it('exports the drawing as SVG and its data as CSV without the chart library', async () => {
    const saved = watchDownloads();
    const wrapper = mount(SnapshotChart, { props: { svg: SVG, spec, name: 'leg_bars' }, attachTo: document.body });
    await wrapper.get('button[aria-label="Export chart"]').trigger('click');
    const items = wrapper.findAll('[role=menuitem]');
    expect(items.map((i) => i.text())).toEqual(['Picture (PNG)', 'Vector drawing (SVG)', 'Chart data (CSV)']);
    await items[1]!.trigger('click');
    // Choosing closes the menu.
    expect(wrapper.find('[role=menu]').exists()).toBe(false);
    await wrapper.get('button[aria-label="Export chart"]').trigger('click');
    await wrapper.findAll('[role=menuitem]')[2]!.trigger('click');
    expect(saved.map((s) => s.name)).toEqual(['leg_bars.svg', 'leg_bars.csv']);
    expect(await saved[0]!.blob!.text()).toBe(SVG);
    expect(saved[0]!.blob!.type).toBe('image/svg+xml');
    expect(await saved[1]!.blob!.text()).toBe('leg,pct\nleft,5.01\nright,0.04\n');
    expect(chartPng).not.toHaveBeenCalled();
  });

  it('draws the picture (PNG) from the spec only when asked', async () => {
    const saved = watchDownloads();
    const wrapper = mount(SnapshotChart, { props: { svg: SVG, spec, name: 'leg_bars' }, attachTo: document.body });
    await wrapper.get('button[aria-label="Export chart"]').trigger('click');
    await wrapper.findAll('[role=menuitem]')[0]!.trigger('click');
    await flushPromises();
    await vi.waitFor(() => expect(saved.map((s) => s.name)).toEqual(['leg_bars.png']));
    expect(chartPng).toHaveBeenCalledTimes(1);
    expect(chartPng.mock.calls[0]![0]).toEqual(spec);
    expect(saved[0]!.href).toBe('data:image/png;base64,AAAA');
  });

  it('closes its menu on Escape and on a click elsewhere', async () => {
    const wrapper = mount(SnapshotChart, { props: { svg: SVG, spec }, attachTo: document.body });
    await wrapper.get('button[aria-label="Export chart"]').trigger('click');
    expect(wrapper.get('button[aria-label="Export chart"]').attributes('aria-expanded')).toBe('true');
    await wrapper.get('figure').trigger('keydown', { key: 'Escape' });
    expect(wrapper.find('[role=menu]').exists()).toBe(false);
    await wrapper.get('button[aria-label="Export chart"]').trigger('click');
    document.body.dispatchEvent(new Event('pointerdown', { bubbles: true }));
    await wrapper.vm.$nextTick();
    expect(wrapper.find('[role=menu]').exists()).toBe(false);
  });

  it('has no export menu when exports are off', () => {
    const wrapper = mount(SnapshotChart, { props: { svg: SVG, spec, exportable: false } });
    expect(wrapper.find('button').exists()).toBe(false);
    expect(wrapper.find('svg.marks').exists()).toBe(true);
  });
});
