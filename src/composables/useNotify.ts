import { App } from 'ant-design-vue';

/** Short confirmations and failures that fit in a toast, themed like the rest of the app. */
export function useNotify() {
  const { message } = App.useApp();
  return {
    success: (text: string) => void message.success(text),
    error: (text: string) => void message.error(text),
  };
}
