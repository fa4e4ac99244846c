/**
 * Repairs ARIA that ant-design-vue 4 renders wrongly, wherever its widgets appear:
 *
 * - a Select's search input is a `combobox` without `aria-expanded` while closed, and it
 *   points `aria-owns`/`aria-controls`/`aria-activedescendant` at a list that only exists once
 *   the dropdown has opened (screen readers follow dead references; axe rates both critical);
 * - the Table's sort carets are `role="presentation"` spans that still carry an `aria-label`.
 *
 * Referenced ids are parked in `data-cb-*` while their target is missing and put back once it
 * exists, because Vue only re-sets an attribute when its value changes.
 */
const REFERENCES = ['aria-owns', 'aria-controls', 'aria-activedescendant'] as const;

function parkedName(attr: string): string {
  return `data-cb-${attr}`;
}

function fixCombobox(input: Element, root: Document): void {
  if (!input.hasAttribute('aria-expanded')) input.setAttribute('aria-expanded', 'false');
  for (const attr of REFERENCES) {
    const parked = parkedName(attr);
    const wanted = input.getAttribute(attr) ?? input.getAttribute(parked);
    if (!wanted) continue;
    const present = wanted.split(/\s+/).every((id) => root.getElementById(id) !== null);
    if (present) {
      if (input.getAttribute(attr) !== wanted) input.setAttribute(attr, wanted);
      if (input.hasAttribute(parked)) input.removeAttribute(parked);
    } else {
      if (input.getAttribute(parked) !== wanted) input.setAttribute(parked, wanted);
      if (input.hasAttribute(attr)) input.removeAttribute(attr);
    }
  }
}

function fixDecorativeIcon(icon: Element): void {
  icon.removeAttribute('aria-label');
  icon.setAttribute('aria-hidden', 'true');
}

/** One pass over the document; safe to run any number of times. */
export function repairAntdAria(root: Document): void {
  for (const input of root.querySelectorAll('input[role="combobox"]')) fixCombobox(input, root);
  for (const icon of root.querySelectorAll('.anticon[role="presentation"][aria-label]')) fixDecorativeIcon(icon);
}

const BUSY = '.monaco-editor, .chart-view__canvas';

function insideBusyWidget(record: MutationRecord): boolean {
  const target = record.target instanceof Element ? record.target : record.target.parentElement;
  return target !== null && target.closest(BUSY) !== null;
}

/**
 * Keeps the document repaired as widgets render, open and close. Answers a function that
 * stops watching.
 */
export function watchAntdAria(root: Document): () => void {
  let queued = false;
  const observer = new MutationObserver((records) => {
    // The code editor and the charts change on every keystroke and redraw and hold no
    // ant-design widgets: a pass over the document for those would only cost time.
    if (queued || records.every(insideBusyWidget)) return;
    queued = true;
    queueMicrotask(() => {
      queued = false;
      repairAntdAria(root);
      // Our own writes queue records too; drop them so the repair does not feed itself.
      observer.takeRecords();
    });
  });
  observer.observe(root.documentElement, {
    subtree: true,
    childList: true,
    attributes: true,
    attributeFilter: ['aria-expanded', ...REFERENCES, 'aria-label'],
  });
  repairAntdAria(root);
  return () => observer.disconnect();
}
