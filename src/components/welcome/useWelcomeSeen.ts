import { ref, type Ref } from 'vue';

/** Remembered per browser: once dismissed, the first-visit explanation stays closed. */
export const WELCOME_DISMISSED_KEY = 'cogbook.welcomeDismissed';

function readDismissed(): boolean {
  try {
    return globalThis.localStorage?.getItem(WELCOME_DISMISSED_KEY) === '1';
  } catch {
    return false;
  }
}

/** Whether the welcome is open, with dismiss and reopen that survive a reload. */
export function useWelcomeSeen(): { open: Ref<boolean>; dismiss: () => void; reopen: () => void } {
  const open = ref(!readDismissed());
  function remember(dismissed: boolean): void {
    try {
      if (dismissed) globalThis.localStorage?.setItem(WELCOME_DISMISSED_KEY, '1');
      else globalThis.localStorage?.removeItem(WELCOME_DISMISSED_KEY);
    } catch {
      // Private mode or storage full: the welcome simply shows again next time.
    }
  }
  return {
    open,
    dismiss: () => {
      open.value = false;
      remember(true);
    },
    reopen: () => {
      open.value = true;
      remember(false);
    },
  };
}
