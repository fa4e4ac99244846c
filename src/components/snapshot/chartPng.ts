/**
 * A stored chart as a PNG picture (twice its size on screen), drawn again from its spec by the
 * chart library on a canvas, with the page's fonts. Loaded only when a reader asks for one.
 */
export async function chartPng(spec: Record<string, unknown>, width: number): Promise<string> {
  const [{ default: embed }, { expressionInterpreter }] = await Promise.all([import('vega-embed'), import('vega-interpreter')]);
  // Off screen at the chart's width, so a container-wide spec is drawn as the page shows it.
  const host = document.createElement('div');
  host.style.position = 'fixed';
  host.style.left = '-100000px';
  host.style.top = '0';
  host.style.width = `${width}px`;
  document.body.append(host);
  try {
    const result = await embed(host, { height: 260, ...spec } as Parameters<typeof embed>[1], {
      // The page's policy forbids eval: vega's expressions run in its interpreter.
      ast: true,
      expr: expressionInterpreter,
      actions: false,
      renderer: 'svg',
      logLevel: 0,
      config: { font: 'IBM Plex Sans, system-ui, sans-serif', view: { stroke: '#E5DFD2' } },
    });
    try {
      return await result.view.toImageURL('png', 2);
    } finally {
      result.finalize();
    }
  } finally {
    host.remove();
  }
}
