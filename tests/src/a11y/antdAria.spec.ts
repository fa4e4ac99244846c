import { afterEach, describe, expect, it } from 'vitest';
import { repairAntdAria, watchAntdAria } from '@/a11y/antdAria';

afterEach(() => {
  document.body.innerHTML = '';
});

function combobox(id: string): HTMLInputElement {
  document.body.insertAdjacentHTML(
    'beforeend',
    `<input id="${id}" role="combobox" aria-owns="${id}_list" aria-controls="${id}_list" aria-activedescendant="${id}_list_0">`,
  );
  return document.getElementById(id) as HTMLInputElement;
}

describe('repairAntdAria', () => {
  it('gives a closed select its aria-expanded and parks references to a list not rendered yet', () => {
    const input = combobox('s1');

    repairAntdAria(document);

    expect(input.getAttribute('aria-expanded')).toBe('false');
    expect(input.hasAttribute('aria-owns')).toBe(false);
    expect(input.hasAttribute('aria-controls')).toBe(false);
    expect(input.getAttribute('data-cb-aria-controls')).toBe('s1_list');
  });

  it('puts the references back once the list exists', () => {
    const input = combobox('s2');
    repairAntdAria(document);

    document.body.insertAdjacentHTML('beforeend', '<div id="s2_list" role="listbox"><div id="s2_list_0" role="option"></div></div>');
    repairAntdAria(document);

    expect(input.getAttribute('aria-owns')).toBe('s2_list');
    expect(input.getAttribute('aria-controls')).toBe('s2_list');
    expect(input.getAttribute('aria-activedescendant')).toBe('s2_list_0');
    expect(input.hasAttribute('data-cb-aria-owns')).toBe(false);
  });

  it('hides the table\'s decorative sort carets instead of labelling them', () => {
    document.body.innerHTML = '<span class="anticon" role="presentation" aria-label="caret-up"></span><span class="anticon" role="img" aria-label="delete"></span>';

    repairAntdAria(document);

    const [caret, icon] = document.querySelectorAll('.anticon');
    expect(caret!.hasAttribute('aria-label')).toBe(false);
    expect(caret!.getAttribute('aria-hidden')).toBe('true');
    expect(icon!.getAttribute('aria-label')).toBe('delete');
  });
});

describe('watchAntdAria', () => {
  it('repairs a select rendered after it started watching', async () => {
    const stop = watchAntdAria(document);
    const input = combobox('s3');

    await new Promise((r) => setTimeout(r, 0));
    stop();

    expect(input.getAttribute('aria-expanded')).toBe('false');
    expect(input.hasAttribute('aria-owns')).toBe(false);
  });
});
