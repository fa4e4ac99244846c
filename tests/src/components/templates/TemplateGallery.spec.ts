import { mount } from '@vue/test-utils';
import { describe, expect, it } from 'vitest';
import { PROTOCOL_CAUTIONS } from '../../../../shared/demo/cautions.js';
import { listTemplates } from '../../../../shared/demo/templates.js';
import { cautionItems, protocolSteps } from '@/components/templates/cautionItems';
import TemplateGallery from '@/components/templates/TemplateGallery.vue';

function mountGallery(props: Partial<InstanceType<typeof TemplateGallery>['$props']> = {}) {
  return mount(TemplateGallery, { props: { canCreate: true, busyKey: null, workspaceName: 'Hill Lab', ...props } });
}

describe('TemplateGallery', () => {
  it('shows every template with its title, what it shows and the files it needs', () => {
    const wrapper = mountGallery();

    const cards = wrapper.findAll('article');
    expect(cards).toHaveLength(listTemplates().length);
    for (const [i, t] of listTemplates().entries()) {
      const card = cards[i]!;
      expect(card.get('h3').text()).toBe(t.title);
      expect(card.text()).toContain(t.summary);
      for (const slot of t.document.slots) expect(card.text()).toContain(`${slot.label} file`);
    }
  });

  it('emits the chosen template\'s key from a button named after it', async () => {
    const wrapper = mountGallery();

    const button = wrapper.get('button[aria-label="Start from this template: Per-leg by chainring"]');
    await button.trigger('click');

    expect(wrapper.emitted('start')).toEqual([['per-leg-by-chainring']]);
  });

  it('shows the four safety cautions next to the protocols', () => {
    const text = mountGallery().text();

    expect(text).toContain('Secure the bike on the trainer');
    expect(text).toContain('rider\'s own responsibility');
    expect(text).toContain('checked by a qualified mechanic before the bike is ridden on the road');
    expect(text).toContain('not a certification');
  });

  it('tells a viewer why there is no start button and what to do instead', () => {
    const wrapper = mountGallery({ canCreate: false, workspaceName: 'Hill Lab' });

    expect(wrapper.findAll('button')).toHaveLength(0);
    expect(wrapper.text()).toContain('Switch to a workspace where you are an analyst or admin');
  });

  it('keeps the other templates waiting while one is being created', () => {
    const wrapper = mountGallery({ busyKey: 'steady-blocks' });

    const disabled = wrapper.findAll('button').filter((b) => b.attributes('disabled') !== undefined);
    expect(disabled).toHaveLength(listTemplates().length - 1);
  });
});

describe('cautionItems and protocolSteps', () => {
  it('reads the four cautions out of the notebooks\' own Markdown', () => {
    const items = cautionItems();

    expect(items).toHaveLength(4);
    expect(items.every((i) => !i.includes('**'))).toBe(true);
  });

  it('leaves the protocol steps without their heading or the cautions', () => {
    const note = `## Protocol\n\nRide it.\n\n- Step one.\n\n${PROTOCOL_CAUTIONS}`;

    expect(protocolSteps(note)).toBe('Ride it.\n\n- Step one.');
  });
});
