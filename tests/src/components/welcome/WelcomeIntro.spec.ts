import { mount } from '@vue/test-utils';
import { beforeEach, describe, expect, it } from 'vitest';
import { useWelcomeSeen, WELCOME_DISMISSED_KEY } from '@/components/welcome/useWelcomeSeen';
import WelcomeIntro from '@/components/welcome/WelcomeIntro.vue';

beforeEach(() => localStorage.clear());

describe('WelcomeIntro', () => {
  it('says what Cogbook is for and the three steps, and points to the demo lab when there is one', () => {
    const wrapper = mount(WelcomeIntro, { props: { canCreate: true, hasDemo: true } });

    expect(wrapper.text()).toContain('device under test');
    expect(wrapper.findAll('ol li')).toHaveLength(3);
    expect(wrapper.get('a[href="#demo-lab"]').text()).toBe('demo lab');
  });

  it('asks to be hidden through a labelled button', async () => {
    const wrapper = mount(WelcomeIntro, { props: { canCreate: true, hasDemo: false } });

    await wrapper.get('button[aria-label="Hide this introduction"]').trigger('click');

    expect(wrapper.emitted('dismiss')).toHaveLength(1);
    expect(wrapper.find('a[href="#demo-lab"]').exists()).toBe(false);
  });
});

describe('useWelcomeSeen', () => {
  it('stays dismissed for the next visit and opens again on request', () => {
    const first = useWelcomeSeen();
    expect(first.open.value).toBe(true);

    first.dismiss();
    expect(localStorage.getItem(WELCOME_DISMISSED_KEY)).toBe('1');
    const second = useWelcomeSeen();
    expect(second.open.value).toBe(false);

    second.reopen();
    expect(useWelcomeSeen().open.value).toBe(true);
  });
});
