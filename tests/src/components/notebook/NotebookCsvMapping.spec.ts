import { mount } from '@vue/test-utils';
import { describe, expect, it } from 'vitest';
import { csvMappingSchema } from '../../../../shared/recording/csv-mapping.js';
import { inspectCsv } from '../../../../shared/recording/inspect-csv.js';
import NotebookCsvMapping from '@/components/notebook/NotebookCsvMapping.vue';

const CSV = ['elapsed,watts,rpm,notes', '0,201,88,a', '1,205,89,b', '2,199,88,c', '3,210,90,d'].join('\n');

describe('NotebookCsvMapping', { timeout: 30_000 }, () => {
  it('shows the first rows and applies the guessed mapping as a valid one', async () => {
    const inspection = inspectCsv(CSV, 'export.csv');
    const wrapper = mount(NotebookCsvMapping, { props: { inspection }, attachTo: document.body });
    // The preview holds the file's own first rows.
    expect(wrapper.find('.csv-map__preview').text()).toContain('205');
    expect(wrapper.findAll('tr[data-column]').map((r) => r.attributes('data-column'))).not.toContain(inspection.guessedMapping?.time.column);

    await wrapper.get('[data-testid="csv-apply"]').trigger('click');
    const applied = wrapper.emitted('apply')?.[0]?.[0];
    const parsed = csvMappingSchema.safeParse(applied);
    expect(parsed.success).toBe(true);
    expect(parsed.data?.columns).toEqual(inspection.guessedMapping?.columns);
    wrapper.unmount();
  });

  it('starts from the mapping remembered for the slot, over the guess', async () => {
    const inspection = inspectCsv(CSV, 'export.csv');
    const remembered = { delimiter: ',' as const, hasHeader: true, time: { column: 'elapsed', format: 'seconds' as const }, columns: [{ column: 'watts', field: 'power' as const, unit: 'kW' as const }] };
    const wrapper = mount(NotebookCsvMapping, { props: { inspection, mapping: remembered }, attachTo: document.body });
    await wrapper.get('[data-testid="csv-apply"]').trigger('click');
    expect(wrapper.emitted('apply')?.[0]?.[0]).toEqual(remembered);
    wrapper.unmount();
  });

  it('labels every select for a screen reader, on the combobox input itself', () => {
    const inspection = inspectCsv(CSV, 'export.csv');
    const wrapper = mount(NotebookCsvMapping, { props: { inspection }, attachTo: document.body });
    const inputs = wrapper.findAll('input[role="combobox"]');
    // Time column, its format, and what each of the three other columns holds (units only once mapped).
    expect(inputs.length).toBeGreaterThanOrEqual(5);
    // A <label for> the input's id, or a <label> wrapping it.
    const names = inputs.map((input) => {
      const id = input.attributes('id');
      const label = (id && document.querySelector(`label[for="${id}"]`)) || input.element.closest('label');
      return label?.textContent?.trim() ?? '';
    });
    expect(names.filter((n) => n === '')).toEqual([]);
    expect(names).toContain('What watts holds');
    // One slot's mapping may be open twice on a page (its cell and the inputs panel): ids stay distinct.
    const ids = wrapper.findAll('.csv-map__columns input[role="combobox"]').map((i) => i.attributes('id'));
    expect(new Set(ids).size).toBe(ids.length);
    wrapper.unmount();
  });

  it('will not apply a mapping without a power column', () => {
    const inspection = inspectCsv(CSV, 'export.csv');
    const mapping = { time: { column: 'elapsed', format: 'seconds' as const }, columns: [{ column: 'rpm', field: 'cadence' as const, unit: 'rpm' as const }] };
    const wrapper = mount(NotebookCsvMapping, { props: { inspection, mapping } });
    expect(wrapper.get('[data-testid="csv-apply"]').attributes('disabled')).toBeDefined();
    expect(wrapper.text()).toContain('Map at least one power column');
  });
});
